// What common salts, acids and bases give in water.
//
// `ions` is the stoichiometry of complete dissociation (ion -> count per formula unit), written
// with the charge after a caret: 'Na^+', 'SO4^2-', 'HCO3^-'. `strong` says whether that
// dissociation is essentially complete in dilute solution (strong electrolyte). `note` records
// where the ions then react further (weak acid/base equilibria, complexes, sparingly soluble
// salts). Acid/base constants quoted are 25 °C values from memory of the CRC Handbook of Chemistry
// and Physics, "Dissociation Constants of Inorganic Acids and Bases".
//
// H2CO3 (dissolved CO2) is deliberately not listed: it is a weak acid (pKa1 6.35) present mostly
// as CO2(aq), not a salt to be dissolved.

export const DISSOCIATION: Readonly<Record<string, { ions: Record<string, number>; strong: boolean; note?: string }>> = Object.freeze({
  // Halides
  NaCl: { ions: { 'Na^+': 1, 'Cl^-': 1 }, strong: true },
  KCl: { ions: { 'K^+': 1, 'Cl^-': 1 }, strong: true },
  LiCl: { ions: { 'Li^+': 1, 'Cl^-': 1 }, strong: true },
  NH4Cl: { ions: { 'NH4^+': 1, 'Cl^-': 1 }, strong: true, note: 'NH4+ is a weak acid (pKa 9.25): the solution is slightly acidic' },
  CuCl2: { ions: { 'Cu^2+': 1, 'Cl^-': 2 }, strong: true, note: 'chloro complexes (CuCl+, CuCl2, CuCl4^2-) form in concentrated or chloride-rich solutions' },
  NiCl2: { ions: { 'Ni^2+': 1, 'Cl^-': 2 }, strong: true },
  ZnCl2: { ions: { 'Zn^2+': 1, 'Cl^-': 2 }, strong: true, note: 'strong chloro-complexing (ZnCl+, ZnCl3-, ZnCl4^2-) in concentrated solutions; free Zn2+ much lower' },

  // Hydroxides
  NaOH: { ions: { 'Na^+': 1, 'OH^-': 1 }, strong: true },
  KOH: { ions: { 'K^+': 1, 'OH^-': 1 }, strong: true },
  LiOH: { ions: { 'Li^+': 1, 'OH^-': 1 }, strong: true, note: 'some LiOH ion pairing in concentrated solution' },

  // Carbonates
  NaHCO3: { ions: { 'Na^+': 1, 'HCO3^-': 1 }, strong: true, note: 'the salt dissociates fully, but HCO3- is amphiprotic and weak (pKa2 10.33, pKa1 of H2CO3* 6.35): it partly gives CO3^2- and CO2; solutions lose CO2 on heating' },
  KHCO3: { ions: { 'K^+': 1, 'HCO3^-': 1 }, strong: true, note: 'HCO3- is a weak amphiprotic ion (pKa2 10.33); loses CO2 on heating' },
  Na2CO3: { ions: { 'Na^+': 2, 'CO3^2-': 1 }, strong: true, note: 'CO3^2- is a weak base (pKb 3.67): partly hydrolysed to HCO3- + OH-' },
  K2CO3: { ions: { 'K^+': 2, 'CO3^2-': 1 }, strong: true, note: 'CO3^2- is a weak base (pKb 3.67): partly hydrolysed to HCO3- + OH-' },
  Li2CO3: { ions: { 'Li^+': 2, 'CO3^2-': 1 }, strong: true, note: 'sparingly soluble (about 1.3 g per 100 g water at 20 °C, falling with temperature; Perry\'s, from memory); CO3^2- is a weak base' },

  // Sulfates
  Na2SO4: { ions: { 'Na^+': 2, 'SO4^2-': 1 }, strong: true },
  K2SO4: { ions: { 'K^+': 2, 'SO4^2-': 1 }, strong: true },
  '(NH4)2SO4': { ions: { 'NH4^+': 2, 'SO4^2-': 1 }, strong: true, note: 'NH4+ is a weak acid (pKa 9.25)' },
  CuSO4: { ions: { 'Cu^2+': 1, 'SO4^2-': 1 }, strong: true, note: '2:2 electrolyte: appreciable CuSO4 ion pairing; Cu2+ hydrolyses slightly (solution pH ~4)' },
  NiSO4: { ions: { 'Ni^2+': 1, 'SO4^2-': 1 }, strong: true, note: '2:2 electrolyte: appreciable ion pairing' },
  ZnSO4: { ions: { 'Zn^2+': 1, 'SO4^2-': 1 }, strong: true, note: '2:2 electrolyte: appreciable ion pairing' },
  Na2S2O8: { ions: { 'Na^+': 2, 'S2O8^2-': 1 }, strong: true, note: 'peroxodisulfate slowly hydrolyses (faster when hot or acidic)' },

  // Nitrates, chlorine oxyanion salts, chromium(VI)
  NaNO3: { ions: { 'Na^+': 1, 'NO3^-': 1 }, strong: true },
  KNO3: { ions: { 'K^+': 1, 'NO3^-': 1 }, strong: true },
  AgNO3: { ions: { 'Ag^+': 1, 'NO3^-': 1 }, strong: true },
  NaClO: { ions: { 'Na^+': 1, 'ClO^-': 1 }, strong: true, note: 'ClO- is a weak base (HClO pKa 7.53): below pH ~7.5 mostly HClO; decomposes to chlorate when warm' },
  NaClO3: { ions: { 'Na^+': 1, 'ClO3^-': 1 }, strong: true },
  NaClO4: { ions: { 'Na^+': 1, 'ClO4^-': 1 }, strong: true },
  K2Cr2O7: { ions: { 'K^+': 2, 'Cr2O7^2-': 1 }, strong: true, note: 'Cr2O7^2- + H2O <-> 2 HCrO4- <-> 2 CrO4^2- + 2 H+ (HCrO4- pKa about 6.5): dichromate in acid, chromate in alkali' },
  CrO3: {
    // CrO3 is an acid anhydride: CrO3 + H2O -> H2CrO4 (chromic acid). Listed by the ions of H2CrO4,
    // so the ion stoichiometry balances CrO3 + H2O, not CrO3 alone.
    ions: { 'H^+': 2, 'CrO4^2-': 1 },
    strong: false,
    note: 'dissolves as H2CrO4 (CrO3 + H2O); first proton strong, second weak (HCrO4- pKa about 6.5); in concentrated (plating) solutions mostly HCrO4- and Cr2O7^2-',
  },

  // Acids
  H2SO4: { ions: { 'H^+': 2, 'SO4^2-': 1 }, strong: true, note: 'first proton strong; HSO4- is only moderately strong (pKa2 1.99), so HSO4- predominates below pH ~2' },
  HCl: { ions: { 'H^+': 1, 'Cl^-': 1 }, strong: true },
  HNO3: { ions: { 'H^+': 1, 'NO3^-': 1 }, strong: true },
})
