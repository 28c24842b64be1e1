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

/** One provider of the season: organisation, study, and its one sign-in. */
function provider(
  slug: string,
  name: string,
  studySlug: SeasonProvider["studySlug"],
  email: string,
  userName: string,
): SeasonProvider {
  return { slug, name, kind: "provider", studySlug, user: { email, name: userName } };
}

const BARLEY = "barley-nitrogen";
const HEAT_PUMPS = "heat-pump-savings";

export const SEASON_PROVIDERS: readonly SeasonProvider[] = [
  provider("wrenfold", "Wrenfold Farm", BARLEY, "provider@wrenfold.test", "Bethan Corrie"),
  provider("cowslip-ley", "Cowslip Ley Farm", BARLEY, "provider@cowslip.test", "Ruairi Nolde"),
  provider("tallowbeck", "Tallowbeck Farm", BARLEY, "provider@tallowbeck.test", "Soraya Penhale"),
  provider("pennyrigg", "Pennyrigg Farm", BARLEY, "provider@pennyrigg.test", "Alasdair Brume"),
  provider(
    "tarnbrook-heating",
    "Tarnbrook Heating Co-operative",
    HEAT_PUMPS,
    "installer@tarnbrook.test",
    "Wilhelmina Garrow",
  ),
  provider("emberlane", "Emberlane Heat Pumps", HEAT_PUMPS, "installer@emberlane.test", "Keziah Marr"),
  provider("kestrel-row", "Kestrel Row Retrofit", HEAT_PUMPS, "installer@kestrelrow.test", "Idris Fenwold"),
];
