import type { RulePack } from "../vocabulary";

/**
 * Which rule packs apply where. A branch has a place (ISO 3166-1 alpha-2 country, and a state or
 * region); each pack says which places it covers, and a branch is audited against the packs that
 * cover its place. Packs the law imposes on a place (US federal rules, the EU regulation) always
 * apply there; a stricter local pack (a state's or a city's rules) would be one the organisation
 * switches on, covering only its own region, and is passed as `chosen`.
 */

export interface BranchPlace {
  /** ISO 3166-1 alpha-2, upper case (US, DE …). */
  country: string;
  /** State, province or region within the country (US: the two-letter state code); null when not given. */
  region: string | null;
}

/** EU member states (ISO 3166-1 alpha-2), the places Regulation (EU) 2024/573 binds. Source: europa.eu, "EU countries" (27 members since 2020-02-01). */
export const EU_MEMBER_STATES: readonly string[] = [
  "AT",
  "BE",
  "BG",
  "HR",
  "CY",
  "CZ",
  "DK",
  "EE",
  "FI",
  "FR",
  "DE",
  "GR",
  "HU",
  "IE",
  "IT",
  "LV",
  "LT",
  "LU",
  "MT",
  "NL",
  "PL",
  "PT",
  "RO",
  "SK",
  "SI",
  "ES",
  "SE",
];

/** Where the United States federal rules apply: the states, DC and the territories under the Clean Air Act. */
export const US_PLACES: readonly string[] = ["US", "PR", "GU", "VI", "AS", "MP"];

export interface RulePackCoverage {
  pack: RulePack;
  /** Plain words for where it applies (settings page). */
  where: string;
  /** Required by law in the places it covers (applies without being chosen). */
  mandatory: boolean;
  covers(place: BranchPlace): boolean;
}

export const RULE_PACK_COVERAGE: Readonly<Record<RulePack, RulePackCoverage>> = {
  us_federal: {
    pack: "us_federal",
    where: "branches in the United States and its territories",
    mandatory: true,
    covers: (p) => US_PLACES.includes(p.country.toUpperCase()),
  },
  eu: {
    pack: "eu",
    where: "branches in a member state of the European Union",
    mandatory: true,
    covers: (p) => EU_MEMBER_STATES.includes(p.country.toUpperCase()),
  },
};

/**
 * The packs that apply to a branch in `place`: every mandatory pack covering it, plus the packs the
 * organisation chose that cover it. In the order of `RULE_PACK_COVERAGE`.
 */
export function packsForPlace(place: BranchPlace, chosen: readonly RulePack[] = []): RulePack[] {
  return Object.values<RulePackCoverage>(RULE_PACK_COVERAGE)
    .filter((c) => c.covers(place) && (c.mandatory || chosen.includes(c.pack)))
    .map((c) => c.pack);
}

/** The packs an audit applies to one branch: those the officer chose for the audit that also apply to the branch. */
export function packsForBranchAudit(place: BranchPlace, auditPacks: readonly RulePack[], chosen: readonly RulePack[] = []): RulePack[] {
  return packsForPlace(place, chosen).filter((p) => auditPacks.includes(p));
}

/**
 * ISO 3166-1 alpha-2 codes in current use (249 entries).
 * Source: ISO 3166 Maintenance Agency, officially assigned codes.
 */
export const ISO_COUNTRY_CODES: readonly string[] = (
  "AD AE AF AG AI AL AM AO AQ AR AS AT AU AW AX AZ BA BB BD BE BF BG BH BI BJ BL BM BN BO BQ BR BS BT BV BW BY BZ " +
  "CA CC CD CF CG CH CI CK CL CM CN CO CR CU CV CW CX CY CZ DE DJ DK DM DO DZ EC EE EG EH ER ES ET FI FJ FK FM FO FR " +
  "GA GB GD GE GF GG GH GI GL GM GN GP GQ GR GS GT GU GW GY HK HM HN HR HT HU ID IE IL IM IN IO IQ IR IS IT JE JM JO JP " +
  "KE KG KH KI KM KN KP KR KW KY KZ LA LB LC LI LK LR LS LT LU LV LY MA MC MD ME MF MG MH MK ML MM MN MO MP MQ MR MS MT " +
  "MU MV MW MX MY MZ NA NC NE NF NG NI NL NO NP NR NU NZ OM PA PE PF PG PH PK PL PM PN PR PS PT PW PY QA RE RO RS RU RW " +
  "SA SB SC SD SE SG SH SI SJ SK SL SM SN SO SR SS ST SV SX SY SZ TC TD TF TG TH TJ TK TL TM TN TO TR TT TV TW TZ UA UG " +
  "UM US UY UZ VA VC VE VG VI VN VU WF WS YE YT ZA ZM ZW"
).split(" ");

/** US states, DC and territories by their two-letter postal codes (the region of a US branch). Source: USPS Publication 28, Appendix B. */
export const US_REGION_CODES: readonly string[] = (
  "AL AK AZ AR CA CO CT DE DC FL GA HI ID IL IN IA KS KY LA ME MD MA MI MN MS MO MT NE NV NH NJ NM NY NC ND OH OK OR PA " +
  "RI SC SD TN TX UT VT VA WA WV WI WY AS GU MP PR VI"
).split(" ");

/** A country's name in English for a code ("DE" → "Germany"); the code itself when unknown. */
export function countryName(code: string): string {
  try {
    return new Intl.DisplayNames(["en"], { type: "region" }).of(code.toUpperCase()) ?? code;
  } catch {
    return code;
  }
}

/** "Dallas, TX, United States" style words for a place (without the city). */
export function placeWords(place: BranchPlace): string {
  const country = countryName(place.country);
  return place.region ? `${place.region}, ${country}` : country;
}
