// Aqueous solubility against temperature, as grams of ANHYDROUS solute per 100 g of WATER.
//
// PROVENANCE. No handbook table is on this machine. Every number below is transcribed from memory
// of the handbook named beside it ("from memory of ..."). Where a value was compared with a stored
// public page through the project's search tool, the comment says "checked against <page>"; a page
// is a check, never the source. Values I could not recall with reasonable confidence are left out
// and the comment says so; nothing is interpolated or invented to fill a gap.
//
// Two handbook conventions are used:
//   [CRC-SOL] CRC Handbook of Chemistry and Physics, "Aqueous Solubility of Inorganic Compounds at
//             Various Temperatures". Basis: MASS PERCENT of solute in the saturated SOLUTION,
//             100·w2 with w2 = m2/(m1 + m2), at 0, 10, 20, 25, 30, ..., 100 °C. Converted here to
//             g per 100 g water with the table's own formula  r2 = 100·w2/(1 − w2), i.e. for a
//             mass percent p:  r = 100·p/(100 − p)  (see `perWater`). The basis and the formula
//             were checked against the table's introduction as stored at
//             hbcp.chemnetbase.com/faces/documents/05_33/05_33_0001.xhtml and zanotowane.pl/1022/9389.
//   [PERRY]   Perry's Chemical Engineers' Handbook, "Solubilities of Inorganic Compounds in Water
//             at Various Temperatures" (Table 2-120 or 2-122 depending on the edition). Basis:
//             grams of ANHYDROUS substance per 100 g of water (used as is; no conversion). The
//             basis was checked against the table heading as stored at
//             scribd.com/document/59820713/Tablas-de-Solubilidad.
//   Check page [ROMEK]: romek.info/baza/04-26.html, a Polish handbook table in g anhydrous per
//             100 g water at 0/20/40/60/80/100 °C (some rows there are in mass %, noted where used).
//
// Solid phases. Solubility is against the stable solid at each temperature, so a curve has kinks
// where the hydrate changes; piecewise-linear interpolation across a kink is only approximate:
//   - Na2SO4: Na2SO4·10H2O (Glauber's salt) below 32.38 °C, anhydrous Na2SO4 above; the solubility
//     peaks at the transition (about 50 g/100 g) and FALLS with temperature above it.
//   - Na2CO3: Na2CO3·10H2O below about 32 °C, Na2CO3·7H2O in a narrow band to about 35.4 °C,
//     Na2CO3·H2O above; the solubility also peaks near 35 °C and falls slightly above.
//   - NaOH: NaOH·4H2O / NaOH·3.5H2O at low temperature, NaOH·H2O from 12.3 to 61.8 °C (checked
//     against the Great Soviet Encyclopedia entry at encyclopedia2.thefreedictionary.com), anhydrous
//     NaOH above. The curve is very steep between 10 and 20 °C.
//   - KOH: KOH·2H2O below about 33 °C, KOH·H2O above.
//   - K2CO3: K2CO3·1.5H2O over the whole range.
//   - CuSO4: CuSO4·5H2O over the whole range. LiOH: LiOH·H2O.
//   - NiSO4: NiSO4·7H2O below 30.7 °C, tetragonal NiSO4·6H2O from 30.7 to 53.8 °C, another
//     hexahydrate above (transition temperatures checked against cryer.org.uk/nickel_(II)_sulphate).
//   - ZnSO4: ZnSO4·7H2O below about 39 °C, ZnSO4·6H2O above.
//   - NaHCO3 and KHCO3 lose CO2 from hot solutions; values above about 60 °C are not equilibrium
//     solubilities of the bicarbonate and are not given.

export interface SolubilityCurve {
  formula: string
  points: readonly [celsius: number, gPer100gWater: number][]
  source: string
  note?: string
}

/** g solute per 100 g water from the mass percent p of a saturated solution: r = 100·p/(100 − p). */
function perWater(massPercent: number): number {
  return (100 * massPercent) / (100 - massPercent)
}

/** Converts a [°C, mass %] row of the CRC table to [°C, g per 100 g water]. */
function fromMassPercent(rows: readonly [number, number][]): [number, number][] {
  return rows.map(([t, p]) => [t, perWater(p)])
}

const CRC_SOL =
  'CRC Handbook of Chemistry and Physics, "Aqueous Solubility of Inorganic Compounds at Various Temperatures" (mass % of solution, converted r = 100p/(100-p)); from memory'
const PERRY_SOL =
  "Perry's Chemical Engineers' Handbook, \"Solubilities of Inorganic Compounds in Water at Various Temperatures\" (g anhydrous per 100 g water); from memory"

const curves: SolubilityCurve[] = [
  {
    formula: 'NaCl',
    // [CRC-SOL] mass %, from memory: 26.28 26.32 26.41 26.45 26.52 26.67 26.84 27.03 27.25 27.50
    // 27.78 28.05 at 0..100 °C (25 °C included). Checked against the Salt Institute table
    // (saltinstitute.org "Chemical properties": 26.29 % at 0 °C, 26.45 % at 21.1 °C, 28.12 % at
    // 100 °C; agreement within 0.1 mass %) and the 90 °C binary point of Wang et al., ACS Omega 5
    // (2020) 4875 (pmc.ncbi.nlm.nih.gov PMC7081322, 27.80 %).
    // HANDBOOKS DISAGREE at high temperature: older tables ([ROMEK], also Perry's) give 39.8 g/100 g
    // at 100 °C where the CRC mass % converts to 39.0; the CRC value is kept (the CRC table draws on
    // evaluated IUPAC Solubility Data Series values where they exist, per its introduction, and it
    // matches the Salt Institute's 28.12 % = 39.1 g/100 g).
    points: fromMassPercent([
      [0, 26.28], [10, 26.32], [20, 26.41], [25, 26.45], [30, 26.52], [40, 26.67],
      [50, 26.84], [60, 27.03], [70, 27.25], [80, 27.5], [90, 27.78], [100, 28.05],
    ]),
    source: CRC_SOL,
    note: 'anhydrous NaCl is the solid phase above 0.1 °C (NaCl·2H2O below)',
  },
  {
    formula: 'KCl',
    // [CRC-SOL] mass %, from memory: 21.74 23.61 25.39 26.22 27.04 28.59 30.04 31.40 32.66 33.86
    // 34.99 36.05. Converted: 34.03 g/100 g at 20 °C.
    // HANDBOOKS DISAGREE slightly at 20 °C: Perry's gives 34.0, the widely copied textbook /
    // Wikipedia "Solubility table" row gives 34.2 (from memory of both). CRC kept (evaluated data).
    points: fromMassPercent([
      [0, 21.74], [10, 23.61], [20, 25.39], [25, 26.22], [30, 27.04], [40, 28.59],
      [50, 30.04], [60, 31.4], [70, 32.66], [80, 33.86], [90, 34.99], [100, 36.05],
    ]),
    source: CRC_SOL,
  },
  {
    formula: 'NaHCO3',
    // [PERRY] from memory; 0/20/40/60 °C checked against [ROMEK] (6.9, 9.6, 12.7, 16.4).
    points: [[0, 6.9], [10, 8.15], [20, 9.6], [30, 11.1], [40, 12.7], [50, 14.45], [60, 16.4]],
    source: PERRY_SOL,
    note: 'hot solutions lose CO2 (2 HCO3- -> CO3^2- + CO2 + H2O); no values above 60 °C',
  },
  {
    formula: 'Na2CO3',
    // [PERRY] from memory at 0, 10, 20, 30 °C; 40/60/80/100 °C taken from [ROMEK] (48.5, 46.4, 45.8,
    // 45.5), which agree with my memory of Perry's to within about 1 g. 50, 70, 90 °C left out (not
    // recalled reliably). The 30 °C value (38.8) is the least certain; my memory of the CRC mass %
    // (28.7 %) converts to 40.3.
    // HANDBOOKS DISAGREE above 80 °C: a 2020 measurement at 90 °C (ACS Omega 5, 4875; PMC7081322)
    // gives 30.50 % = 43.9 g/100 g, below the 45.5-45.8 of the older tables. The older values kept.
    points: [[0, 7.1], [10, 12.5], [20, 21.5], [30, 38.8], [40, 48.5], [60, 46.4], [80, 45.8], [100, 45.5]],
    source: `${PERRY_SOL}; 40-100 °C as printed at romek.info/baza/04-26.html`,
    note: 'solid Na2CO3·10H2O below ~32 °C, ·7H2O to ~35.4 °C, ·H2O above; maximum near 35 °C',
  },
  {
    formula: 'K2CO3',
    // [PERRY] from memory. Checked at 0 and 20 °C: [ROMEK] prints 51.3 and 52.5 (mass %, the CRC
    // convention) -> 105.3 and 110.5 g/100 g.
    points: [
      [0, 105.5], [10, 108], [20, 110.5], [30, 113.7], [40, 116.9], [50, 121.2],
      [60, 126.8], [70, 133.1], [80, 139.8], [90, 147.5], [100, 155.7],
    ],
    source: PERRY_SOL,
    note: 'solid K2CO3·1.5H2O',
  },
  {
    formula: 'KHCO3',
    // [PERRY] from memory, not checked against any page: least certain of the bicarbonate rows.
    points: [[0, 22.4], [10, 27.7], [20, 33.2], [30, 39.1], [40, 45.4], [50, 52], [60, 60]],
    source: PERRY_SOL,
    note: 'hot solutions lose CO2; no values above 60 °C',
  },
  {
    formula: 'Na2SO4',
    // [PERRY] from memory; 20/40/60/80/100 °C checked against [ROMEK] (19.4, 48.8, 45.3, 43.7, 42.5;
    // [ROMEK] gives 5.0 at 0 °C where Perry's has 4.76). My memory of the CRC mass % row agrees to
    // within about 1 % of value (e.g. 16.13 % -> 19.2 at 20 °C, 32.5 % -> 48.1 at 40 °C); 90 °C
    // checked against ACS Omega 5, 4875 (29.91 % = 42.7 g/100 g, between the 80 and 100 °C values).
    // No 25, 70 or 90 °C point from Perry's recalled reliably: left out.
    points: [[0, 4.76], [10, 9], [20, 19.4], [30, 40.8], [40, 48.8], [50, 46.7], [60, 45.3], [80, 43.7], [100, 42.5]],
    source: PERRY_SOL,
    note: 'Na2SO4·10H2O below 32.38 °C (solubility rises steeply), anhydrous Na2SO4 above (solubility falls); peak ~50 g/100 g at the transition is under-estimated by interpolation between 30 and 40 °C',
  },
  {
    formula: 'K2SO4',
    // [PERRY] from memory; agrees with my memory of the CRC mass % row (6.85 % at 0 °C -> 7.35;
    // 10.0 % at 20 °C -> 11.11) to within about 1 %.
    points: [
      [0, 7.35], [10, 9.22], [20, 11.11], [30, 12.97], [40, 14.76], [50, 16.5],
      [60, 18.17], [70, 19.75], [80, 21.4], [90, 22.8], [100, 24.1],
    ],
    source: PERRY_SOL,
  },
  {
    formula: 'NaOH',
    // [PERRY] from memory; 0/20/40/60 °C checked against [ROMEK] (42, 109, 129, 174); 20 and 80 °C
    // checked against the Great Soviet Encyclopedia (52.2 % at 20 °C = 109.2; 75.8 % at 80 °C =
    // 313.2). 70 and 90 °C left out. 100 °C (347) is the least certain value of this row.
    // HANDBOOKS DISAGREE NEAR 20 °C: Perry's / Lange's / [ROMEK] / the GSE give 109 g/100 g
    // (52.2 %) at 20 °C, while the CRC table as I remember it, and the current Wikipedia infobox,
    // give 50.0 % = 100 g/100 g at 25 °C (Wikipedia has also printed "1110 g/L (20 °C)"; both
    // infobox versions were seen on stored copies). The two cannot both be right: the NaOH·H2O
    // curve rises with temperature, so 109 at 20 °C and 100 at 25 °C contradict each other.
    // CHOSEN: 109 at 20 °C, because it is printed by several independent tables and lies on a
    // smooth NaOH·H2O curve with the 30/40/50 °C values (54.3 %, 56.3 %, 59.2 % by mass), which the
    // CRC row shares; the CRC 25 °C point is NOT included. Also, the Wikipedia value 3370 g/L at
    // 100 °C (337 g/100 g) disagrees with Perry's 347; Perry's kept, flagged as uncertain.
    points: [[0, 42], [10, 51.5], [20, 109], [30, 119], [40, 129], [50, 145], [60, 174], [80, 313], [100, 347]],
    source: PERRY_SOL,
    note: 'solid NaOH·4H2O/·3.5H2O below ~12 °C, NaOH·H2O 12.3-61.8 °C, NaOH above; very steep 10-20 °C',
  },
  {
    formula: 'KOH',
    // [PERRY] from memory; 0/20/50/100 °C checked against [ROMEK] (97, 112, 140, 178) and 0/20 °C
    // against the Great Soviet Encyclopedia (97 and 112 g per 100 g H2O). 70-90 °C not recalled.
    points: [[0, 97], [10, 103], [20, 112], [30, 126], [40, 134], [50, 140], [60, 154], [100, 178]],
    source: PERRY_SOL,
    note: 'solid KOH·2H2O below ~33 °C, KOH·H2O above',
  },
  {
    formula: 'NaClO3',
    // [PERRY] from memory at 0, 10, 20 °C (79, 89, 101). The 25, 40 and 100 °C values are the
    // Wikipedia "Sodium chlorate" infobox figures 105.7, 125 and 220.4 "g/100 mL" (stored copy at
    // wiki.av1.space), read as g per 100 mL of WATER and divided by the water density at that
    // temperature (0.99705, 0.99222, 0.95835 g/mL, CRC): 106.0, 126.0, 230.0; 230 is also what I
    // remember Perry's printing at 100 °C. 0 and 10 °C checked against the IUPAC Solubility Data
    // Series evaluation (vol. 30, Miyamoto 1984; docslib.org/doc/3090157): 7.465 mol/kg = 79.5 and
    // 8.220 mol/kg = 87.5 g/100 g. Perry's 30-80 °C values are not recalled reliably: left out, so
    // interpolation between 40 and 100 °C is a straight chord under a convex curve (reads high by
    // up to ~10 % near 70 °C).
    points: [[0, 79], [10, 89], [20, 101], [25, 106], [40, 126], [100, 230]],
    source: `${PERRY_SOL}; 25/40/100 °C from the Wikipedia infobox (checked page), converted per 100 g water`,
    note: 'anhydrous NaClO3 is the solid phase 0-100 °C',
  },
  {
    formula: 'NaClO4',
    // Only one value known: 209.6 g per 100 mL water at 25 °C (Wikipedia "Sodium perchlorate"
    // infobox, stored copy at findatwiki.com; my memory of the CRC mass %, about 67.8 %, gives
    // 210.6), divided by 0.99705 g/mL -> 210.2 g/100 g. Other temperatures are not recalled
    // reliably and are left out: solubilityAt clamps to this point and reports extrapolated.
    points: [[25, 210.2]],
    source: 'CRC Handbook "Aqueous Solubility of Inorganic Compounds" (from memory, ~67.8 % at 25 °C), checked against the Wikipedia infobox (209.6 g/100 mL)',
    note: 'solid NaClO4·H2O at 25 °C',
  },
  {
    formula: 'CuSO4',
    // [PERRY] from memory; 0/20/40/60/80/100 °C checked against [ROMEK] (14.3, 20.7, 28.5, 40, 55,
    // 75.4). 70 and 90 °C not recalled.
    points: [[0, 14.3], [10, 17.4], [20, 20.7], [30, 25], [40, 28.5], [50, 33.3], [60, 40], [80, 55], [100, 75.4]],
    source: PERRY_SOL,
    note: 'solid CuSO4·5H2O',
  },
  {
    formula: 'NiSO4',
    // Least certain row. 0 °C: 27.2 g/100 g (Perry's 27.22 and CRC 21.4 % -> 27.2 agree, both from
    // memory). 25 °C: CRC 28.8 % -> 40.4 g/100 g (from memory). I do not recall the other
    // temperatures reliably and leave them out: solubilityAt clamps outside 0-25 °C.
    points: fromMassPercent([[0, 21.4], [25, 28.8]]),
    source: CRC_SOL,
    note: 'solid NiSO4·7H2O below 30.7 °C, NiSO4·6H2O 30.7-53.8 °C',
  },
  {
    formula: 'LiOH',
    // [PERRY] from memory; not checked against a page. The Wikipedia infobox (from memory) gives
    // 12.7 (0 °C), 12.8 (20 °C) and 17.5 (100 °C) "g/100 mL", which agree.
    points: [[0, 12.7], [10, 12.7], [20, 12.8], [30, 12.9], [40, 13], [50, 13.3], [60, 13.8], [80, 15.3], [100, 17.5]],
    source: PERRY_SOL,
    note: 'solid LiOH·H2O; g of anhydrous LiOH',
  },
  {
    formula: 'NaNO3',
    // [PERRY] from memory; 0/20/40/60/80/100 °C checked against [ROMEK] (73, 88, 104, 124, 148, 180).
    // 70 and 90 °C not recalled.
    points: [[0, 73], [10, 80], [20, 88], [30, 96], [40, 104], [50, 114], [60, 124], [80, 148], [100, 180]],
    source: PERRY_SOL,
  },
  {
    formula: 'KNO3',
    // [PERRY] from memory; 0/20/40/60/80/100 °C checked against [ROMEK] (13.3, 31.6, 63.9, 110, 169,
    // 246) and 10/100 °C against a stored textbook page (issuhub.com: 21 and 246 g per 100 g water).
    points: [
      [0, 13.3], [10, 20.9], [20, 31.6], [30, 45.8], [40, 63.9], [50, 85.5],
      [60, 110], [70, 138], [80, 169], [90, 202], [100, 246],
    ],
    source: PERRY_SOL,
  },
  {
    formula: 'ZnSO4',
    // [PERRY] from memory at 0 and 20 °C (41.9, 54.4), checked against [ROMEK]. Higher temperatures
    // are left out: [ROMEK]'s 40-100 °C entries for ZnSO4·6H2O and ZnSO4 are in an unclear basis,
    // and I do not recall Perry's values there reliably.
    points: [[0, 41.9], [20, 54.4]],
    source: PERRY_SOL,
    note: 'solid ZnSO4·7H2O',
  },
  // LiCl is deliberately NOT included: the handbooks I remember disagree near 20 °C (Perry's ~78,
  // CRC 45.3 % -> ~83 g/100 g, across the LiCl·2H2O / LiCl·H2O transition near 19 °C) and I cannot
  // say which figure is right from memory.
]

/** Solubility curves keyed by the formula as a chemist writes it ('NaCl', 'K2CO3', 'CuSO4', ...). */
export const SOLUBILITY: Readonly<Record<string, SolubilityCurve>> = Object.freeze(
  Object.fromEntries(curves.map((c) => [c.formula, Object.freeze(c)])),
)

/**
 * Solubility (g anhydrous solute per 100 g water) at a Celsius temperature, by piecewise-linear
 * interpolation between table points. Outside the table's temperature range the value is clamped
 * to the nearest end point and `extrapolated` is true. Unknown formula or non-finite temperature:
 * undefined.
 */
export function solubilityAt(
  formula: string,
  celsius: number,
): { gPer100gWater: number; extrapolated: boolean } | undefined {
  const curve = Object.prototype.hasOwnProperty.call(SOLUBILITY, formula.trim())
    ? SOLUBILITY[formula.trim()]
    : undefined
  if (!curve || !Number.isFinite(celsius) || curve.points.length === 0) return undefined
  const pts = curve.points
  const first = pts[0]
  const last = pts[pts.length - 1]
  if (celsius < first[0]) return { gPer100gWater: first[1], extrapolated: true }
  if (celsius > last[0]) return { gPer100gWater: last[1], extrapolated: true }
  for (let i = 0; i < pts.length; i++) {
    const [t1, s1] = pts[i]
    if (celsius === t1) return { gPer100gWater: s1, extrapolated: false }
    if (celsius < t1) {
      const [t0, s0] = pts[i - 1]
      return { gPer100gWater: s0 + ((s1 - s0) * (celsius - t0)) / (t1 - t0), extrapolated: false }
    }
  }
  return { gPer100gWater: last[1], extrapolated: false }
}
