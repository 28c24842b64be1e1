/** "3 d 4 h", "5 h", "25 min": how long something has waited, in words a lead reads at a glance. */
export function formatHours(h: number | null | undefined): string {
  if (h === null || h === undefined || !Number.isFinite(h)) return "–";
  if (h < 1) return `${Math.round(h * 60)} min`;
  if (h < 48) return `${h < 10 ? h.toFixed(1) : Math.round(h)} h`;
  const d = Math.floor(h / 24);
  return `${d} d ${Math.round(h - d * 24)} h`;
}
