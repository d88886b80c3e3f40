// Density of aqueous solutions at 20 °C against mass percent of (anhydrous) solute.
//
// SOURCE. CRC Handbook of Chemistry and Physics, "Concentrative Properties of Aqueous Solutions:
// Density, Refractive Index, Freezing Point Depression, and Viscosity" (all data at 20 °C; density
// in g/cm3 = g/mL against mass %). No copy of the table is on this machine: every value below is
// FROM MEMORY of that table unless a comment says otherwise. Where a value was compared with a
// stored public page (through the project's search tool) the comment says "checked" and names it:
//   [ETB-Na]  engineeringtoolbox.com "Density of aqueous solutions of inorganic sodium salts"
//             (20 °C, 1/5/10/20/30/40 mass %), a reprint of the CRC table.
//   [ETB-X]   engineeringtoolbox.com "Density of aqueous solutions of some inorganic substances"
//             (20 °C; CuSO4, H2SO4 columns).
//   [WIKI-Na] Wikipedia "Sodium chloride (data page)", properties of water-NaCl mixtures (CRC).
//   [UMK]     fizyka.umk.pl/~lab2/tables/NaCl.html (Poradnik fizykochemiczny, WNT 1974), NaCl at
//             20 °C to 26 %.
//   [PK18]    fizyka.pk.edu.pl/tabele/GesRoztw.htm, densities at 18 °C (NaCl, KOH, HCl, H2SO4,
//             CuSO4) at 5 % steps; at 18 °C a solution is about 0.0004-0.0015 g/mL denser than at
//             20 °C, so it checks shape and magnitude, not the last digit.
// Points the CRC table prints that I do not recall with confidence are LEFT OUT (linear
// interpolation bridges them); nothing is interpolated to fill the table.
//
// Pure water at 20 °C: 0.99820 g/mL, the 0 % row (CRC "Properties of Water in the Range 0-100 °C"
// gives 0.998207; constants.ts rounds the same value to 0.99821).

export const WATER_20C = 0.9982

type Table = { points: readonly [wtPercent: number, gPerMl: number][]; source: string }

const CRC_DENS =
  'CRC Handbook of Chemistry and Physics, "Concentrative Properties of Aqueous Solutions" (20 °C, g/mL vs mass %); from memory'

const tables: Record<string, Table> = {
  NaOH: {
    // 1, 5, 10, 20, 30, 40 % checked against [ETB-Na] (1.0095, 1.0538, 1.1089, 1.2192, 1.3277,
    // 1.4299). 50 % (1.5253) from memory of CRC and of Perry's NaOH density table; 42-48 % are the
    // least certain values of this row. Internal check: 19.35 % NaOH (6 mol/kg) interpolates to
    // 1.2120 at 20 °C, and advancedthermo.com/electrolytes/density_NaOH.html gives 1.20866 at
    // 25 °C, i.e. the expected ~0.003 lower.
    points: [
      [0, WATER_20C], [0.5, 1.0039], [1, 1.0095], [2, 1.0207], [3, 1.0318], [4, 1.0428],
      [5, 1.0538], [6, 1.0648], [7, 1.0758], [8, 1.0869], [9, 1.0979], [10, 1.1089],
      [12, 1.1309], [14, 1.153], [16, 1.1751], [18, 1.1972], [20, 1.2192], [22, 1.2412],
      [24, 1.2631], [26, 1.2848], [28, 1.3064], [30, 1.3277], [32, 1.3488], [34, 1.3697],
      [36, 1.3901], [38, 1.4102], [40, 1.4299], [42, 1.4494], [44, 1.4685], [46, 1.4873],
      [48, 1.5065], [50, 1.5253],
    ],
    source: `${CRC_DENS}; 1/5/10/20/30/40 % checked against Engineering ToolBox (CRC reprint)`,
  },
  KOH: {
    // Only the 10 % steps are recalled with confidence: 1.0918, 1.1884, 1.2905, 1.3991, and
    // 1.5143 at 50 % (least certain). The 0.5-9 % and 2 %-step rows of the CRC table are NOT
    // recalled reliably and are left out. Checked against [PK18] (18 °C: 1.091, 1.188, 1.290,
    // 1.400 at 10/20/30/40 %) and a vendor figure for 45 % KOH, 1.456 g/mL at 25 °C
    // (mcblabprotocols.com), which lies between the 40 and 50 % values.
    // HANDBOOKS DISAGREE in the third decimal: an older 15 °C table quoted on orchid.ganoksin.com
    // gives 1.3043 (32 %) and 1.3254 (34 %), about 0.002 above the CRC 20 °C curve as expected
    // for 5 K; not used.
    points: [[0, WATER_20C], [10, 1.0918], [20, 1.1884], [30, 1.2905], [40, 1.3991], [50, 1.5143]],
    source: `${CRC_DENS}; 10 % steps only, checked against an 18 °C table (fizyka.pk.edu.pl)`,
  },
  NaCl: {
    // 0.5-20 % checked against [WIKI-Na] (CRC-derived) and 1-26 % against [UMK] (1005.3 ... 1197.2
    // kg/m3 at 20 °C): every point below matches to 0.0001 g/mL. Saturation at 20 °C is 26.4 %.
    points: [
      [0, WATER_20C], [0.5, 1.0018], [1, 1.0053], [2, 1.0125], [3, 1.0196], [4, 1.0268],
      [5, 1.034], [6, 1.0413], [7, 1.0486], [8, 1.0559], [9, 1.0633], [10, 1.0707],
      [12, 1.0857], [14, 1.1008], [16, 1.1162], [18, 1.1319], [20, 1.1478], [22, 1.164],
      [24, 1.1804], [26, 1.1972],
    ],
    source: `${CRC_DENS}; checked against Wikipedia "Sodium chloride (data page)" and fizyka.umk.pl (WNT 1974)`,
  },
  KCl: {
    // From memory, not checked against a handbook page; a low-authority calculator page
    // (cal53.calculator.city, "KCl solution density") quotes 10 % about 1.063 and 20 % about 1.132,
    // which agrees. Saturation at 20 °C is 25.4 %.
    points: [
      [0, WATER_20C], [0.5, 1.0014], [1, 1.0046], [2, 1.011], [3, 1.0174], [4, 1.0239],
      [5, 1.0304], [6, 1.0369], [7, 1.0434], [8, 1.05], [9, 1.0566], [10, 1.0633],
      [12, 1.0768], [14, 1.0905], [16, 1.1043], [18, 1.1185], [20, 1.1328], [22, 1.1474],
      [24, 1.1623],
    ],
    source: CRC_DENS,
  },
  Na2SO4: {
    // 1, 5, 10, 20 % checked against [ETB-Na] (1.0071, 1.0436, 1.0905, 1.1907). The 2-4, 8 and
    // 12-18 % values are from memory only; the CRC 6, 7, 9 % rows are not recalled and left out.
    // 20 % is above saturation at 20 °C (16.1 %): the CRC table includes supersaturated solutions.
    points: [
      [0, WATER_20C], [1, 1.0071], [2, 1.0161], [3, 1.0252], [4, 1.0343], [5, 1.0436],
      [8, 1.0713], [10, 1.0905], [12, 1.1101], [14, 1.1301], [16, 1.1503], [18, 1.1705],
      [20, 1.1907],
    ],
    source: `${CRC_DENS}; 1/5/10/20 % checked against Engineering ToolBox (CRC reprint)`,
  },
  K2CO3: {
    // From memory. 10 % checked against a stored pharmacopoeia-style page (chestofbooks.com: 10 %
    // K2CO3, specific gravity 1.092 at 15 °C, i.e. ~0.001 above the 20 °C value as expected).
    // 40 and 50 % are the least certain values (saturation at 20 °C is 52.5 %).
    points: [
      [0, WATER_20C], [1, 1.0072], [2, 1.0163], [4, 1.0345], [6, 1.0529], [8, 1.0715],
      [10, 1.0904], [12, 1.1095], [14, 1.1291], [16, 1.149], [18, 1.1692], [20, 1.1898],
      [24, 1.232], [28, 1.2755], [40, 1.4141], [50, 1.5404],
    ],
    source: `${CRC_DENS}; 40 and 50 % least certain`,
  },
  Na2CO3: {
    // 1, 5, 10 % checked against [ETB-Na] (1.0086, 1.0502, 1.1029); the others from memory.
    // Saturation at 20 °C is about 17.9 %; the CRC rows above 14 % are not recalled and left out.
    points: [
      [0, WATER_20C], [1, 1.0086], [2, 1.019], [4, 1.0398], [5, 1.0502], [6, 1.0606],
      [8, 1.0816], [10, 1.1029], [12, 1.1244], [14, 1.1463],
    ],
    source: `${CRC_DENS}; 1/5/10 % checked against Engineering ToolBox (CRC reprint)`,
  },
  H2SO4: {
    // 1, 5, 10, 20, 30, 40, 50, 70 % checked against [ETB-X] (1.0049, 1.0318, 1.0661, 1.1398,
    // 1.2191, 1.3028, 1.3952, 1.6105; I had remembered 20 % as 1.1394 and 30 % as 1.2185 and took
    // the checked figures). The others are from memory. The CRC table continues to 100 %
    // (1.8305, checked), but the density passes a MAXIMUM near 97-98 % (about 1.836) and falls
    // again; the table here stops at 90 % so that density stays strictly increasing with mass %,
    // which the inversions below rely on.
    points: [
      [0, WATER_20C], [0.5, 1.0016], [1, 1.0049], [2, 1.0116], [3, 1.0183], [4, 1.025],
      [5, 1.0318], [6, 1.0385], [8, 1.0522], [10, 1.0661], [12, 1.0802], [14, 1.0947],
      [16, 1.1094], [18, 1.1245], [20, 1.1398], [22, 1.1554], [24, 1.1714], [28, 1.2031],
      [30, 1.2191], [32, 1.2353], [34, 1.2518], [36, 1.2685], [38, 1.2855], [40, 1.3028],
      [42, 1.3205], [44, 1.3386], [46, 1.357], [48, 1.3759], [50, 1.3952], [60, 1.4983],
      [70, 1.6105], [80, 1.7272], [90, 1.8144],
    ],
    source: `${CRC_DENS}; 1-70 % decade points checked against Engineering ToolBox (CRC reprint); stops at 90 % (maximum near 97 %)`,
  },
  HCl: {
    // From memory; checked in shape against [PK18] (18 °C: 1.0236, 1.0482, 1.0989, 1.1508 at
    // 5/10/20/30 %, each 0.0006-0.0016 above the 20 °C values below as expected). 32-36 % are the
    // least certain (concentrated acid is about 37 %).
    points: [
      [0, WATER_20C], [0.5, 1.0007], [1, 1.0031], [2, 1.0081], [4, 1.0179], [5, 1.0228],
      [6, 1.0278], [8, 1.0377], [10, 1.0476], [12, 1.0576], [14, 1.0676], [16, 1.0777],
      [18, 1.0878], [20, 1.098], [22, 1.1083], [24, 1.1185], [26, 1.1288], [28, 1.1391],
      [30, 1.1492], [32, 1.1594], [34, 1.1693], [36, 1.1791],
    ],
    source: `${CRC_DENS}; compared with an 18 °C table (fizyka.pk.edu.pl)`,
  },
  CuSO4: {
    // 1, 5, 10 % checked against [ETB-X] (1.0085, 1.0511, 1.107); the others from memory; [PK18]
    // gives 1.167 at 15 % and 18 °C, between the 14 and 16 % values below. Saturation at 20 °C is
    // about 17 % (anhydrous basis); no value above 16 % is given.
    points: [
      [0, WATER_20C], [0.5, 1.0033], [1, 1.0085], [2, 1.019], [4, 1.0403], [5, 1.0511],
      [6, 1.062], [8, 1.0842], [10, 1.107], [12, 1.1301], [14, 1.1538], [16, 1.178],
    ],
    source: `${CRC_DENS}; 1/5/10 % checked against Engineering ToolBox (CRC reprint)`,
  },
}

/** Density tables at 20 °C, keyed by formula. Mass % of anhydrous solute -> g/mL. */
export const DENSITY_20C: Readonly<
  Record<string, { points: readonly [wtPercent: number, gPerMl: number][]; source: string }>
> = Object.freeze(Object.fromEntries(Object.entries(tables).map(([k, v]) => [k, Object.freeze(v)])))

function tableFor(formula: string): Table | undefined {
  const key = formula.trim()
  return Object.prototype.hasOwnProperty.call(DENSITY_20C, key) ? DENSITY_20C[key] : undefined
}

/**
 * Density (g/mL) at 20 °C of a solution of `wtPercent` mass % solute, by piecewise-linear
 * interpolation of the (strictly increasing) table. Beyond the table's range the end value is
 * returned with `extrapolated: true`. Unknown formula or non-finite input: undefined.
 */
export function solutionDensity(
  formula: string,
  wtPercent: number,
): { gPerMl: number; extrapolated: boolean } | undefined {
  const table = tableFor(formula)
  if (!table || !Number.isFinite(wtPercent)) return undefined
  const pts = table.points
  if (wtPercent < pts[0][0]) return { gPerMl: pts[0][1], extrapolated: true }
  const last = pts[pts.length - 1]
  if (wtPercent > last[0]) return { gPerMl: last[1], extrapolated: true }
  return { gPerMl: interpolated(pts, wtPercent), extrapolated: false }
}

/**
 * The same density as solutionDensity where the table covers `wtPercent`, and undefined where it
 * does not (or the formula is unknown): a number, no object, for the simulation, which asks on
 * every time step.
 */
export function tableDensity(formula: string, wtPercent: number): number | undefined {
  const table = tableFor(formula)
  if (!table || !Number.isFinite(wtPercent)) return undefined
  const pts = table.points
  if (wtPercent < pts[0][0] || wtPercent > pts[pts.length - 1][0]) return undefined
  return interpolated(pts, wtPercent)
}

/** Piecewise-linear interpolation at `w`, which lies within the table's range. */
function interpolated(pts: Table['points'], w: number): number {
  for (let i = 0; i < pts.length; i++) {
    const w1 = pts[i][0]
    const d1 = pts[i][1]
    if (w === w1) return d1
    if (w < w1) {
      const w0 = pts[i - 1][0]
      const d0 = pts[i - 1][1]
      return d0 + ((d1 - d0) * (w - w0)) / (w1 - w0)
    }
  }
  return pts[pts.length - 1][1]
}

/**
 * Solves f(w) = target for w in [0, wMax] by bisection, where f is increasing (it is, since both
 * w and ρ(w) increase). Returns undefined when target lies outside [f(0), f(wMax)].
 */
function invert(table: Table, target: number, f: (w: number, rho: number) => number): number | undefined {
  if (!Number.isFinite(target) || target < 0) return undefined
  const pts = table.points
  const wMax = pts[pts.length - 1][0]
  const value = (w: number) => {
    const d = solutionDensityFromTable(table, w)
    return f(w, d)
  }
  if (target === 0) return 0
  const top = value(wMax)
  if (target > top * (1 + 1e-12)) return undefined
  let lo = 0
  let hi = wMax
  for (let i = 0; i < 200 && hi - lo > 1e-12; i++) {
    const mid = (lo + hi) / 2
    if (value(mid) < target) lo = mid
    else hi = mid
  }
  return (lo + hi) / 2
}

function solutionDensityFromTable(table: Table, w: number): number {
  const pts = table.points
  if (w <= pts[0][0]) return pts[0][1]
  for (let i = 1; i < pts.length; i++) {
    const [w1, d1] = pts[i]
    if (w <= w1) {
      const [w0, d0] = pts[i - 1]
      return d0 + ((d1 - d0) * (w - w0)) / (w1 - w0)
    }
  }
  return pts[pts.length - 1][1]
}

/**
 * Mass percent w of a solution whose molarity is `molPerL` (mol/L), at 20 °C, given the solute's
 * molar mass (g/mol): solves c = 10·ρ(w)·w/M (w in %, ρ in g/mL) by bisection on the table.
 * Undefined for an unknown formula, a negative or non-finite input, or a molarity beyond the
 * table's last point.
 */
export function massFractionFromMolarity(formula: string, molPerL: number, molarMass: number): number | undefined {
  const table = tableFor(formula)
  if (!table || !(molarMass > 0) || !Number.isFinite(molarMass)) return undefined
  return invert(table, molPerL, (w, rho) => (10 * rho * w) / molarMass)
}

/**
 * Mass percent w of a solution holding `gPerL` grams of solute per litre of solution, at 20 °C:
 * solves c = 10·ρ(w)·w by bisection on the table. Undefined beyond the table.
 */
export function massFractionFromMassConc(formula: string, gPerL: number): number | undefined {
  const table = tableFor(formula)
  if (!table) return undefined
  return invert(table, gPerL, (w, rho) => 10 * rho * w)
}
