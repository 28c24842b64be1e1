/** How long something has waited: lib/format's formatHours, kept here for the board's imports. */
export { formatHours } from "@/lib/format";
