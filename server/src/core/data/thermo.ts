// Standard enthalpy and Gibbs energy of formation at 298.15 K and 1 bar, kJ/mol.
//
// SOURCE: NBS Tables of Chemical Thermodynamic Properties (Wagman et al., J. Phys. Chem. Ref. Data
// 11, Suppl. 2, 1982), FROM MEMORY; no copy is on this machine. Aqueous species are at the
// hypothetical ideal 1 mol/kg standard state with the convention ΔfH°(H+, aq) = ΔfG°(H+, aq) = 0.
//
// Why NBS and not CODATA: CODATA Key Values for Thermodynamics (Cox, Wagman & Medvedev, 1989) give
// ΔfH° and S° for a smaller set of species, not ΔfG°, and mixing the two sets breaks the additivity
// the NBS tables keep (ΔfG°(NaOH, aq) = ΔfG°(Na+, aq) + ΔfG°(OH-, aq), etc.). The two agree to
// within 0.1 kJ/mol for H2O(l) (−285.830) and CO2(g) (−393.51). Differences I remember for ions
// (CODATA 1989 ΔfH°, from memory; NBS value used here in brackets):
//   Na+ −240.34 [−240.12], K+ −252.14 [−252.38], Cl- −167.080 [−167.159], OH- −230.015 [−229.994],
//   Ag+ 105.79 [105.579], Zn2+ −153.39 [−153.89], Cu2+ 64.9 [64.77], SO4^2- −909.34 [−909.27],
//   CO3^2- −675.23 [−677.14], HCO3- −689.93 [−691.99], Li+ −278.47 [−278.49].
// None of these changes a cell voltage computed here by more than about 5 mV.
// Least certain values (memory): Ni2+(aq) (−54.0 / −45.6; the CRC/BPJ potential −0.257 V implies
// ΔfG° ≈ −49.6), ClO-(aq), ClO3-(aq), K2CO3(s), KOH(s).

type Entry = { dHf: number; dGf: number; state: 's' | 'l' | 'g' | 'aq'; source: string }

const NBS = 'NBS Tables of Chemical Thermodynamic Properties (1982), from memory'
const DEF = 'element in its reference state (zero by definition)'
const CONV = 'zero by convention for aqueous ions'

function e(dHf: number, dGf: number, state: Entry['state'], source = NBS): Entry {
  return { dHf, dGf, state, source }
}

const table: Record<string, Entry> = {
  'H2O(l)': e(-285.83, -237.129, 'l'),
  'H2O(g)': e(-241.818, -228.572, 'g'),
  'H2(g)': e(0, 0, 'g', DEF),
  'O2(g)': e(0, 0, 'g', DEF),
  'Cl2(g)': e(0, 0, 'g', DEF),
  'CO2(g)': e(-393.509, -394.359, 'g'),
  'H2O2(aq)': e(-191.17, -134.03, 'aq'),

  'H^+(aq)': e(0, 0, 'aq', CONV),
  'OH^-(aq)': e(-229.994, -157.244, 'aq'),
  'Li^+(aq)': e(-278.49, -293.31, 'aq'),
  'Na^+(aq)': e(-240.12, -261.905, 'aq'),
  'K^+(aq)': e(-252.38, -283.27, 'aq'),
  'Cl^-(aq)': e(-167.159, -131.228, 'aq'),
  'ClO^-(aq)': e(-107.1, -36.8, 'aq'),
  'ClO3^-(aq)': e(-103.97, -7.95, 'aq'),
  'SO4^2-(aq)': e(-909.27, -744.53, 'aq'),
  'HSO4^-(aq)': e(-887.34, -755.91, 'aq'),
  'CO3^2-(aq)': e(-677.14, -527.81, 'aq'),
  'HCO3^-(aq)': e(-691.99, -586.77, 'aq'),

  // Strong electrolytes "(aq)" = sum of the ions (NBS lists them that way).
  'NaOH(aq)': e(-470.114, -419.15, 'aq'),
  'KOH(aq)': e(-482.37, -440.5, 'aq'),
  'NaCl(aq)': e(-407.27, -393.133, 'aq'),
  'KCl(aq)': e(-419.53, -414.49, 'aq'),

  'Cu^2+(aq)': e(64.77, 65.49, 'aq'),
  'Cu^+(aq)': e(71.67, 49.98, 'aq'),
  'Cu(s)': e(0, 0, 's', DEF),
  'Ni^2+(aq)': e(-54.0, -45.6, 'aq'),
  'Ni(s)': e(0, 0, 's', DEF),
  'Zn^2+(aq)': e(-153.89, -147.06, 'aq'),
  'Zn(s)': e(0, 0, 's', DEF),
  'Ag^+(aq)': e(105.579, 77.107, 'aq'),
  'Ag(s)': e(0, 0, 's', DEF),

  'NaCl(s)': e(-411.153, -384.138, 's'),
  'NaOH(s)': e(-425.609, -379.494, 's'),
  'KOH(s)': e(-424.764, -379.08, 's'),
  'K2CO3(s)': e(-1151.02, -1063.5, 's'),
  'Na2CO3(s)': e(-1130.68, -1044.44, 's'),
}

/** ΔfH° and ΔfG° at 298.15 K, kJ/mol, keyed like 'H2O(l)', 'OH^-(aq)', 'Cu^2+(aq)', 'Cu(s)'. */
export const THERMO: Readonly<Record<string, { dHf: number; dGf: number; state: 's' | 'l' | 'g' | 'aq'; source: string }>> =
  Object.freeze(Object.fromEntries(Object.entries(table).map(([k, v]) => [k, Object.freeze(v)])))
