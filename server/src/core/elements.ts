// Standard atomic weights, relative to 12C = 12 (dimensionless; numerically g/mol).
//
// Source: IUPAC Commission on Isotopic Abundances and Atomic Weights (CIAAW), "Standard atomic
// weights of the elements 2021" (T. Prohaska et al., Pure Appl. Chem. 94 (2022) 573-600). This
// table keeps the 2021 values on purpose; CIAAW revised Zr, Gd and Lu in 2024 (Zr 91.224 ->
// 91.222, Gd 157.25 -> 157.249, Lu 174.9668 -> 174.96669): noted beside those rows.
//
// Which value is used:
// - Elements whose standard atomic weight is a single value with an uncertainty use that value
//   without its uncertainty (e.g. Na 22.98976928(2) -> 22.98976928).
// - Elements whose standard atomic weight is an INTERVAL [a, b] use the CIAAW "conventional"
//   (abridged) single value: H 1.008, Li 6.94, B 10.81, C 12.011, N 14.007, O 15.999,
//   Mg 24.305, Si 28.085, S 32.06, Cl 35.45, Ar 39.95, Br 79.904, Tl 204.38, Pb 207.2.
// - Tc (43), Pm (61) and every element above Bi except Th, Pa and U have no standard atomic weight
//   (no stable isotope and no characteristic terrestrial isotopic composition), so they are NOT in
//   ATOMIC_WEIGHTS. Their symbols are still real elements (ELEMENT_NAMES, isElementSymbol); a
//   formula with one of them has no molar mass.
//
// Provenance: the values below were transcribed from memory of the CIAAW table, not copied from
// a file of it. Cross-checked while writing against the changes listed in the 2013, 2017 and 2021
// CIAAW reports (Cd, Mo, Se, Th; Al, Ar, Co, Au, Ho, Ir, Mn, Nb, Pr, Pa, Rh, Tb, Tm, Y; Hf, Ir, Pb,
// Yb). Least certain are the last digits of the values
// changed by the 2021 report on the basis of the 2020 Atomic Mass Evaluation (F, Sc, Y, Ho, Tb, Tm),
// which differ from the previous values by at most a few parts in 10^7 and do not affect any
// molar mass at the precision this project reports.

type ElementRow = readonly [symbol: string, name: string, weight: number | null]

/** Atomic number order, 1..118. `null`: no standard atomic weight. */
const ELEMENTS: readonly ElementRow[] = [
  ['H', 'hydrogen', 1.008], // interval [1.00784, 1.00811]; conventional
  ['He', 'helium', 4.002602],
  ['Li', 'lithium', 6.94], // interval [6.938, 6.997]; conventional
  ['Be', 'beryllium', 9.0121831],
  ['B', 'boron', 10.81], // interval [10.806, 10.821]; conventional
  ['C', 'carbon', 12.011], // interval [12.0096, 12.0116]; conventional
  ['N', 'nitrogen', 14.007], // interval [14.00643, 14.00728]; conventional
  ['O', 'oxygen', 15.999], // interval [15.99903, 15.99977]; conventional
  ['F', 'fluorine', 18.998403162],
  ['Ne', 'neon', 20.1797],
  ['Na', 'sodium', 22.98976928],
  ['Mg', 'magnesium', 24.305], // interval [24.304, 24.307]; conventional
  ['Al', 'aluminium', 26.9815384],
  ['Si', 'silicon', 28.085], // interval [28.084, 28.086]; conventional
  ['P', 'phosphorus', 30.973761998],
  ['S', 'sulfur', 32.06], // interval [32.059, 32.076]; conventional
  ['Cl', 'chlorine', 35.45], // interval [35.446, 35.457]; conventional
  ['Ar', 'argon', 39.95], // interval [39.792, 39.963] since 2017/2021; conventional
  ['K', 'potassium', 39.0983],
  ['Ca', 'calcium', 40.078],
  ['Sc', 'scandium', 44.955907],
  ['Ti', 'titanium', 47.867],
  ['V', 'vanadium', 50.9415],
  ['Cr', 'chromium', 51.9961],
  ['Mn', 'manganese', 54.938043],
  ['Fe', 'iron', 55.845],
  ['Co', 'cobalt', 58.933194],
  ['Ni', 'nickel', 58.6934],
  ['Cu', 'copper', 63.546],
  ['Zn', 'zinc', 65.38],
  ['Ga', 'gallium', 69.723],
  ['Ge', 'germanium', 72.63],
  ['As', 'arsenic', 74.921595],
  ['Se', 'selenium', 78.971],
  ['Br', 'bromine', 79.904], // interval [79.901, 79.907]; conventional
  ['Kr', 'krypton', 83.798],
  ['Rb', 'rubidium', 85.4678],
  ['Sr', 'strontium', 87.62],
  ['Y', 'yttrium', 88.905838],
  ['Zr', 'zirconium', 91.224], // 2021 table; CIAAW 2024 revised it to 91.222
  ['Nb', 'niobium', 92.90637],
  ['Mo', 'molybdenum', 95.95],
  ['Tc', 'technetium', null],
  ['Ru', 'ruthenium', 101.07],
  ['Rh', 'rhodium', 102.90549],
  ['Pd', 'palladium', 106.42],
  ['Ag', 'silver', 107.8682],
  ['Cd', 'cadmium', 112.414],
  ['In', 'indium', 114.818],
  ['Sn', 'tin', 118.71],
  ['Sb', 'antimony', 121.76],
  ['Te', 'tellurium', 127.6],
  ['I', 'iodine', 126.90447],
  ['Xe', 'xenon', 131.293],
  ['Cs', 'caesium', 132.90545196],
  ['Ba', 'barium', 137.327],
  ['La', 'lanthanum', 138.90547],
  ['Ce', 'cerium', 140.116],
  ['Pr', 'praseodymium', 140.90766],
  ['Nd', 'neodymium', 144.242],
  ['Pm', 'promethium', null],
  ['Sm', 'samarium', 150.36],
  ['Eu', 'europium', 151.964],
  ['Gd', 'gadolinium', 157.25], // 2021 table; CIAAW 2024 revised it to 157.249
  ['Tb', 'terbium', 158.925354],
  ['Dy', 'dysprosium', 162.5],
  ['Ho', 'holmium', 164.930329],
  ['Er', 'erbium', 167.259],
  ['Tm', 'thulium', 168.934219],
  ['Yb', 'ytterbium', 173.045], // 2021 table (before: 173.054)
  ['Lu', 'lutetium', 174.9668], // 2021 table; CIAAW 2024 revised it to 174.96669
  ['Hf', 'hafnium', 178.486], // 2021 table (before: 178.49)
  ['Ta', 'tantalum', 180.94788],
  ['W', 'tungsten', 183.84],
  ['Re', 'rhenium', 186.207],
  ['Os', 'osmium', 190.23],
  ['Ir', 'iridium', 192.217],
  ['Pt', 'platinum', 195.084],
  ['Au', 'gold', 196.96657],
  ['Hg', 'mercury', 200.592],
  ['Tl', 'thallium', 204.38], // interval [204.382, 204.385]; conventional
  ['Pb', 'lead', 207.2], // interval [206.14, 207.94] since 2021; conventional
  ['Bi', 'bismuth', 208.9804],
  ['Po', 'polonium', null],
  ['At', 'astatine', null],
  ['Rn', 'radon', null],
  ['Fr', 'francium', null],
  ['Ra', 'radium', null],
  ['Ac', 'actinium', null],
  ['Th', 'thorium', 232.0377],
  ['Pa', 'protactinium', 231.03588],
  ['U', 'uranium', 238.02891],
  ['Np', 'neptunium', null],
  ['Pu', 'plutonium', null],
  ['Am', 'americium', null],
  ['Cm', 'curium', null],
  ['Bk', 'berkelium', null],
  ['Cf', 'californium', null],
  ['Es', 'einsteinium', null],
  ['Fm', 'fermium', null],
  ['Md', 'mendelevium', null],
  ['No', 'nobelium', null],
  ['Lr', 'lawrencium', null],
  ['Rf', 'rutherfordium', null],
  ['Db', 'dubnium', null],
  ['Sg', 'seaborgium', null],
  ['Bh', 'bohrium', null],
  ['Hs', 'hassium', null],
  ['Mt', 'meitnerium', null],
  ['Ds', 'darmstadtium', null],
  ['Rg', 'roentgenium', null],
  ['Cn', 'copernicium', null],
  ['Nh', 'nihonium', null],
  ['Fl', 'flerovium', null],
  ['Mc', 'moscovium', null],
  ['Lv', 'livermorium', null],
  ['Ts', 'tennessine', null],
  ['Og', 'oganesson', null],
]

function buildWeights(): Readonly<Record<string, number>> {
  const out: Record<string, number> = Object.create(null) as Record<string, number>
  for (const [symbol, , weight] of ELEMENTS) if (weight !== null) out[symbol] = weight
  return Object.freeze(out)
}

function buildNames(): Readonly<Record<string, string>> {
  const out: Record<string, string> = Object.create(null) as Record<string, string>
  for (const [symbol, name] of ELEMENTS) out[symbol] = name
  return Object.freeze(out)
}

/** Symbol -> standard atomic weight (g/mol), for every element that has one. */
export const ATOMIC_WEIGHTS: Readonly<Record<string, number>> = buildWeights()

/** Symbol -> English (IUPAC) name, for all 118 elements. */
export const ELEMENT_NAMES: Readonly<Record<string, string>> = buildNames()

/**
 * True when `s` is exactly (case-sensitively) the symbol of one of the 118 elements. Elements
 * without a standard atomic weight (Tc, Pm, Po, ...) count; see ATOMIC_WEIGHTS for which have one.
 */
export function isElementSymbol(s: string): boolean {
  return typeof s === 'string' && Object.prototype.hasOwnProperty.call(ELEMENT_NAMES, s)
}
