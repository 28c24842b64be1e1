/**
 * Who takes part in the demo's season beyond the seed's accounts (all invented): four more
 * farms and two more installers, each with one provider sign-in (password DEMO_PASSWORD).
 * Pennyrigg Farm is admitted to the barley study and never sends anything. Tarnbrook, seeded
 * without a sign-in, gets one here to send its batches.
 */
import type { DemoOrganisation } from "./accounts";

export type SeasonProvider = DemoOrganisation & {
  studySlug: "barley-nitrogen" | "heat-pump-savings";
  user: { email: string; name: string };
};

export const SEASON_PROVIDERS: readonly SeasonProvider[] = [
  {
    slug: "wrenfold",
    name: "Wrenfold Farm",
    kind: "provider",
    studySlug: "barley-nitrogen",
    user: { email: "provider@wrenfold.test", name: "Bethan Corrie" },
  },
  {
    slug: "cowslip-ley",
    name: "Cowslip Ley Farm",
    kind: "provider",
    studySlug: "barley-nitrogen",
    user: { email: "provider@cowslip.test", name: "Ruairi Nolde" },
  },
  {
    slug: "tallowbeck",
    name: "Tallowbeck Farm",
    kind: "provider",
    studySlug: "barley-nitrogen",
    user: { email: "provider@tallowbeck.test", name: "Soraya Penhale" },
  },
  {
    slug: "pennyrigg",
    name: "Pennyrigg Farm",
    kind: "provider",
    studySlug: "barley-nitrogen",
    user: { email: "provider@pennyrigg.test", name: "Alasdair Brume" },
  },
  {
    slug: "tarnbrook-heating",
    name: "Tarnbrook Heating Co-operative",
    kind: "provider",
    studySlug: "heat-pump-savings",
    user: { email: "installer@tarnbrook.test", name: "Wilhelmina Garrow" },
  },
  {
    slug: "emberlane",
    name: "Emberlane Heat Pumps",
    kind: "provider",
    studySlug: "heat-pump-savings",
    user: { email: "installer@emberlane.test", name: "Keziah Marr" },
  },
  {
    slug: "kestrel-row",
    name: "Kestrel Row Retrofit",
    kind: "provider",
    studySlug: "heat-pump-savings",
    user: { email: "installer@kestrelrow.test", name: "Idris Fenwold" },
  },
];
