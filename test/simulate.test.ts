// The time-stepped cell simulation (server/src/core/simulate.ts), driven through analyze(text) and,
// where a case cannot be written as a protocol, through simulate() directly.
//
// BINDING: every expected number comes from outside the project, with its source beside it, or is
// hand arithmetic from such numbers (shown), or is a property (conservation, monotonicity, a
// limiting case). Nothing is pasted from a run of the code under test.
//
// Sources used below:
//   [SI]     BIPM, SI Brochure, 9th ed. (2019); F = e·N_A = 96 485.332 123 31... C/mol, exact since
//            the 2019 revision (CODATA 2018 lists it truncated as 96 485.332 12); 1 h = 3600 s.
//   [IUPAC]  IUPAC CIAAW standard atomic weights 2021, conventional values where an interval is
//            given: H 1.008, C 12.011, O 15.999, Na 22.989 769 28, K 39.0983 (transcribed from
//            memory). Hence M(H2O) = 2·1.008 + 15.999 = 18.015 g/mol,
//            M(NaOH) = 22.98976928 + 15.999 + 1.008 = 39.99676928 g/mol (≈ 39.997),
//            M(KOH) = 39.0983 + 15.999 + 1.008 = 56.1053 g/mol,
//            M(KHCO3) = 39.0983 + 1.008 + 12.011 + 3·15.999 = 100.1143 g/mol.
//   [BREF]   European Commission JRC, Best Available Techniques Reference Document for the
//            Production of Chlor-alkali (2014), and Euro Chlor's descriptions of the membrane cell:
//            membrane cells deliver 30-35 wt% NaOH (typically 32 %) at a current efficiency of about
//            94-97 % (recalled from memory, not looked up here).
//   [PERRY]  Perry's Chemical Engineers' Handbook, "Solubilities of inorganic compounds in water":
//            KHCO3 33.2 g per 100 g water at 20 °C (from memory; the same figure as the project's
//            table, which cites the same handbook, so this is a check of the use, not of the datum).
//   Element counts of the charged formulas are written out by hand (an exact identity).
//
// Tolerances: conservation 1e-9 relative (double arithmetic over at most a few thousand steps
// accumulates ~1e-13; anything above 1e-9 is a lost or invented species, not rounding). Event
// times: within the step's own window, plus 1e-6 s for the summed time steps' rounding.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { analyze, type Analysis } from '../server/src/core/analyze'
import type { ElectrodeReaction } from '../server/src/core/engine'
import { DEFAULT_DRAG, inventory, simulate, type SimInput, type SimResult } from '../server/src/core/simulate'

// ---- outside numbers ---------------------------------------------------------------------------
// [SI] F = e·N_A with e = 1.602 176 634e-19 C and N_A = 6.022 140 76e23 /mol, both exact:
// 96 485.332 123 310 0... C/mol (the CODATA listing 96 485.332 12 is this value truncated, 3.4e-11
// relative below it, which matters for the 1e-12 checks below).
const F = 1.602176634e-19 * 6.02214076e23
const HOUR = 3600 // [SI] s
const M_H2O = 2 * 1.008 + 15.999 // [IUPAC] 18.015 g/mol
const M_NAOH = 22.98976928 + 15.999 + 1.008 // [IUPAC] 39.99676928 g/mol
const M_KOH = 39.0983 + 15.999 + 1.008 // [IUPAC] 56.1053 g/mol
const M_KHCO3 = 39.0983 + 1.008 + 12.011 + 3 * 15.999 // [IUPAC] 100.1143 g/mol
const KHCO3_SOL_20C = 33.2 // [PERRY] g per 100 g water at 20 °C

/** Element counts per formula unit, written out by hand. */
const COMPOSITION: Record<string, Record<string, number>> = {
  water: { H: 2, O: 1 },
  K2CO3: { K: 2, C: 1, O: 3 },
  KOH: { K: 1, O: 1, H: 1 },
  K2SO4: { K: 2, S: 1, O: 4 },
  NaCl: { Na: 1, Cl: 1 },
  NaOH: { Na: 1, O: 1, H: 1 },
  Na2SO4: { Na: 2, S: 1, O: 4 },
  H2SO4: { H: 2, S: 1, O: 4 },
  CuSO4: { Cu: 1, S: 1, O: 4 },
  'CuSO4·5H2O': { Cu: 1, S: 1, O: 4 + 5, H: 10 },
}

// ---- protocol builder --------------------------------------------------------------------------

/** A charge item: a solid by amount (mol), or water by mass (g). */
type Item = [formula: string, mol: number] | ['water', grams: number]

interface Protocol {
  conditions?: string
  cell: string[]
  charges: Record<string, Item[]>
  steps: string[]
  extra?: string[]
}

function num(x: number): string {
  // Plain decimal (no exponent), as the protocol format reads it.
  return Number.isInteger(x) ? String(x) : x.toFixed(6).replace(/0+$/, '').replace(/\.$/, '')
}

function protocolText(p: Protocol): string {
  const lines = ['run "simulation test"']
  if (p.conditions) lines.push(`conditions ${p.conditions}`)
  lines.push('cell', ...p.cell.map((l) => `  ${l}`))
  for (const [comp, items] of Object.entries(p.charges)) {
    lines.push(`charge ${comp}: ${items.map(([f, x]) => (f === 'water' ? `water ${num(x)} g` : `${f} ${num(x)} mol`)).join(', ')}`)
  }
  lines.push(...p.steps, ...(p.extra ?? []))
  return lines.join('\n') + '\n'
}

/** The elements charged, by hand: Σ n·counts, water as g / M(H2O). */
function chargedElements(p: Protocol): Record<string, number> {
  const el: Record<string, number> = {}
  for (const items of Object.values(p.charges)) {
    for (const [f, x] of items) {
      const comp = COMPOSITION[f]
      if (!comp) throw new Error(`no hand composition for ${f}`)
      const mol = f === 'water' ? Number(num(x)) / M_H2O : Number(num(x))
      for (const [e, n] of Object.entries(comp)) el[e] = (el[e] ?? 0) + n * mol
    }
  }
  return el
}

function sim(a: Analysis): SimResult {
  const s = a.model.simulation
  if (!s) throw new Error(`no simulation; diagnostics: ${a.diagnostics.map((d) => d.message).join('; ')}`)
  return s
}

function run(p: Protocol, options: { efficiencyFloor?: number } = {}): { a: Analysis; s: SimResult } {
  const a = analyze(protocolText(p), options)
  return { a, s: sim(a) }
}

/** Σ|z|·n over the final solutions: the scale the charge balance is measured against. */
function ionicAmount(r: SimResult): number {
  let t = 0
  for (const c of r.final) {
    for (const [k, v] of Object.entries(c.species)) {
      const m = k.match(/\^(\d*)([+-])$/)
      if (m) t += (m[1] ? Number(m[1]) : 1) * v
    }
  }
  return t
}

function expectConserved(before: Record<string, number>, r: SimResult, label: string): void {
  const after = inventory(r)
  const elements = new Set([...Object.keys(before), ...Object.keys(after.elements)])
  for (const e of elements) {
    const b = before[e] ?? 0
    const x = after.elements[e] ?? 0
    // An element present at the end but not charged (or the reverse) fails here too.
    expect(Math.abs(x - b), `${label}: element ${e}, charged ${b}, end ${x}`).toBeLessThanOrEqual(1e-9 * Math.max(b, 1e-12))
  }
  expect(Math.abs(after.charge), `${label}: net charge`).toBeLessThanOrEqual(1e-9 * Math.max(ionicAmount(r), 1))
  // No negative amounts anywhere (the clamp in Solution.add only hides -1e-12).
  for (const c of r.final) {
    for (const [k, v] of Object.entries(c.species)) expect(v, `${label}: ${k} in ${c.name}`).toBeGreaterThanOrEqual(-1e-12)
    for (const [k, v] of Object.entries(c.solids)) expect(v, `${label}: solid ${k} in ${c.name}`).toBeGreaterThanOrEqual(-1e-12)
  }
}

/** [start, end] of each step in seconds from the start of the run, by line. */
function stepWindows(r: SimResult): Map<number, [number, number]> {
  const w = new Map<number, [number, number]>()
  let t0 = 0
  for (const st of r.steps) {
    w.set(st.line, [t0, st.endTime])
    t0 = st.endTime
  }
  return w
}

function expectEventsInWindows(r: SimResult, label: string): void {
  const w = stepWindows(r)
  for (const e of r.events) {
    const win = w.get(e.line)
    expect(win, `${label}: event "${e.message}" on line ${e.line}, which is no step line`).toBeDefined()
    expect(e.time, `${label}: "${e.message}" before its step`).toBeGreaterThanOrEqual(win![0] - 1e-6)
    expect(e.time, `${label}: "${e.message}" after its step`).toBeLessThanOrEqual(win![1] + 1e-6)
  }
}

const totalElectrons = (r: SimResult) => r.steps.reduce((t, s) => t + s.electronMol, 0)
const compartment = (r: SimResult, name: string) => r.final.find((c) => c.name === name)!

// ---- the protocols -----------------------------------------------------------------------------

const membrane = (anode: string, cathode: string, kind = 'cation-exchange', more = '') => [
  'compartment anolyte 2 L',
  'compartment catholyte 2 L',
  `separator ${kind} between anolyte and catholyte, area 100 cm^2${more}`,
  `anode ${anode} in anolyte, area 100 cm^2`,
  `cathode ${cathode} in catholyte, area 100 cm^2`,
]

const PROTOCOLS: Record<string, Protocol> = {
  // K2CO3 feed: 1.0 mol K+; 2 × 10 h at 5 A = 3.73 mol e⁻, far beyond it, so the feed runs out.
  'membrane KOH from K2CO3, run past the feed': {
    conditions: '30 degC',
    cell: membrane('mmo-titanium', 'nickel'),
    charges: { anolyte: [['K2CO3', 0.5], ['water', 420]], catholyte: [['KOH', 0.1], ['water', 240]] },
    steps: ['step 1: current 5 A for 10 h', 'step 2: current 5 A for 10 h'],
  },
  'chlor-alkali membrane': {
    conditions: '80 degC',
    cell: membrane('mmo-titanium', 'nickel'),
    charges: { anolyte: [['NaCl', 4], ['water', 800]], catholyte: [['NaOH', 2], ['water', 600]] },
    steps: ['step 1: current 10 A for 5 h, efficiency 95 %'],
  },
  'Na2SO4 splitting, cation-exchange': {
    cell: membrane('platinum', 'nickel'),
    charges: { anolyte: [['Na2SO4', 1], ['water', 800]], catholyte: [['NaOH', 0.1], ['water', 600]] },
    steps: ['step 1: current 5 A for 8 h'],
  },
  'Na2SO4 splitting, anion-exchange': {
    cell: membrane('platinum', 'nickel', 'anion-exchange'),
    charges: { anolyte: [['H2SO4', 0.05], ['water', 600]], catholyte: [['Na2SO4', 1], ['water', 800]] },
    steps: ['step 1: current 5 A for 8 h'],
  },
  'undivided brine at 70 °C (chlorate)': {
    conditions: '70 degC',
    cell: ['compartment cell 1 L', 'anode mmo-titanium in cell, area 50 cm^2', 'cathode titanium in cell, area 50 cm^2'],
    charges: { cell: [['NaCl', 3], ['water', 900]] },
    steps: ['step 1: current 5 A for 6 h'],
  },
  'copper plating, copper anode': {
    cell: ['compartment bath 2 L', 'anode copper in bath, area 2 dm^2', 'cathode steel in bath, area 2 dm^2'],
    charges: { bath: [['CuSO4·5H2O', 1], ['H2SO4', 1], ['water', 1800]] },
    steps: ['step 1: current 4 A for 2 h, efficiency 97 %', 'step 2: current 4 A for 1 h'],
  },
  // 0.2 mol Cu²⁺ needs 0.4 mol e⁻; 5 A × 5 h = 0.93 mol e⁻, so the copper runs out.
  'copper electrowinning, platinum anode, past the copper': {
    cell: ['compartment bath 1 L', 'anode platinum in bath, area 1 dm^2', 'cathode stainless-steel in bath, area 1 dm^2'],
    charges: { bath: [['CuSO4', 0.2], ['H2SO4', 0.5], ['water', 950]] },
    steps: ['step 1: current 5 A for 3 h, efficiency 95 %', 'step 2: current 5 A for 2 h'],
  },
  'alkaline water electrolysis, diaphragm': {
    conditions: '70 degC',
    cell: membrane('nickel', 'nickel', 'diaphragm'),
    charges: { anolyte: [['KOH', 5], ['water', 800]], catholyte: [['KOH', 5], ['water', 800]] },
    steps: ['step 1: current 20 A for 10 h'],
  },
  // Drag 8 carries 8 mol water per Na⁺ out of the feed: Na2SO4 (19.4 g/100 g at 20 °C) saturates.
  'salt driven past saturation': {
    conditions: '20 degC',
    cell: membrane('platinum', 'nickel', 'cation-exchange', ', drag 8'),
    charges: { anolyte: [['Na2SO4', 1], ['water', 800]], catholyte: [['NaOH', 0.5], ['water', 300]] },
    steps: ['step 1: current 10 A for 8 h'],
  },
}

// ---- 1. conservation ---------------------------------------------------------------------------

describe('conservation of elements and charge', () => {
  for (const [name, p] of Object.entries(PROTOCOLS)) {
    it(name, () => {
      const { a, s } = run(p)
      expect(a.diagnostics.filter((d) => d.severity === 'error')).toEqual([])
      // The run really passed its charge: Σ I·t / F by hand from the step lines.
      expect(totalElectrons(s)).toBeGreaterThan(0)
      expectConserved(chargedElements(p), s, name)
      expectEventsInWindows(s, name)
    })
  }

  it('each case reaches the regime it is meant to cover', () => {
    const r = (n: string) => run(PROTOCOLS[n]).s
    expect(r('membrane KOH from K2CO3, run past the feed').events.some((e) => e.kind === 'feed-exhausted')).toBe(true)
    expect(r('copper electrowinning, platinum anode, past the copper').events.some((e) => e.kind === 'feed-exhausted')).toBe(true)
    expect(compartment(r('undivided brine at 70 °C (chlorate)'), 'cell').species['ClO3^-'] ?? 0).toBeGreaterThan(0)
    expect(Object.keys(compartment(r('salt driven past saturation'), 'anolyte').solids)).toContain('Na2SO4')
    expect(compartment(r('copper plating, copper anode'), 'bath').species['Cu^2+']).toBeGreaterThan(0)
  })

  it('a run held below the reversible voltage passes no current and keeps what was charged', () => {
    // Zero-current initial state through analyze(): 0.5 V is below E_rev of water splitting
    // (1.229 V, from ΔG°f(H2O,l) = −237.1 kJ/mol, NBS tables) and of chlor-alkali.
    for (const name of ['membrane KOH from K2CO3, run past the feed', 'chlor-alkali membrane', 'Na2SO4 splitting, anion-exchange', 'alkaline water electrolysis, diaphragm']) {
      const p = PROTOCOLS[name]
      const held = { ...p, steps: p.steps.map((l) => `${l}, voltage 0.5 V`) }
      const { s } = run(held)
      expect(totalElectrons(s), name).toBe(0)
      expect(s.iterations, name).toBe(0)
      expect(s.gases, name).toEqual({})
      expectConserved(chargedElements(p), s, `${name} (held)`)
    }
  })

  it('Faraday bookkeeping: Σ electrons = Σ I·t/F; H2 = n(e⁻)/2 at a hydrogen cathode, O2 = n(e⁻)/4 at an oxygen anode at 100 %', () => {
    // Na2SO4 splitting: 5 A × 8 h = 144 000 C; / F = 1.492 454 8... mol e⁻ (hand arithmetic).
    const { s } = run(PROTOCOLS['Na2SO4 splitting, cation-exchange'])
    const ne = (5 * 8 * HOUR) / F
    expect(totalElectrons(s) / ne - 1).toBeCloseTo(0, 12)
    expect(s.gases.H2 / (ne / 2) - 1).toBeCloseTo(0, 9)
    expect(s.gases.O2 / (ne / 4) - 1).toBeCloseTo(0, 9)
  })

  it('undivided brine: every electron ends up as hypochlorite or chlorate (ClO⁻ + 3 ClO₃⁻ = n(e⁻)/2)', () => {
    // Cl⁻ → ½Cl2 + e⁻; Cl2 + 2 OH⁻ → ClO⁻ + Cl⁻ + H2O; 3 ClO⁻ → ClO₃⁻ + 2 Cl⁻. One ClO⁻ holds two
    // electrons' worth of oxidation, one ClO₃⁻ six. At 100 % and no Cl2 escaping the sum is exact.
    const { s } = run(PROTOCOLS['undivided brine at 70 °C (chlorate)'])
    const c = compartment(s, 'cell').species
    const ne = (5 * 6 * HOUR) / F
    const oxidised = 2 * (c['ClO^-'] ?? 0) + 6 * (c['ClO3^-'] ?? 0) + 2 * (s.gases.Cl2 ?? 0) + 4 * (s.gases.O2 ?? 0)
    expect(oxidised / ne - 1).toBeCloseTo(0, 9)
  })

  describe('property: random currents, durations, efficiencies and salt amounts', () => {
    // Two steps of at most 10 A × 8 h: ≤ 5.97 mol e⁻, which drags and electrolyses at most
    // (3.5 + 0.5)·5.97 = 24 mol of the anolyte's 50 mol water. Beyond that the anolyte runs dry,
    // which is a bug of its own (see 'bugs found' below), not what this property is about.
    const current = fc.double({ min: 0.05, max: 10, noNaN: true })
    const hours = fc.double({ min: 0.05, max: 8, noNaN: true })
    const eff = fc.integer({ min: 1, max: 100 })

    it('chlor-alkali membrane cell', () => {
      fc.assert(
        fc.property(fc.double({ min: 0.1, max: 5, noNaN: true }), fc.double({ min: 0, max: 3, noNaN: true }), current, hours, eff, current, hours, (nacl, naoh, i1, h1, e1, i2, h2) => {
          const p: Protocol = {
            conditions: '60 degC',
            cell: membrane('mmo-titanium', 'nickel'),
            charges: { anolyte: [['NaCl', nacl], ['water', 900]], catholyte: naoh > 0.001 ? [['NaOH', naoh], ['water', 700]] : [['water', 700]] },
            steps: [`step 1: current ${num(i1)} A for ${num(h1)} h, efficiency ${e1} %`, `step 2: current ${num(i2)} A for ${num(h2)} h`],
          }
          const { s } = run(p)
          expectConserved(chargedElements(p), s, protocolText(p))
          expectEventsInWindows(s, protocolText(p))
        }),
        { numRuns: 40 },
      )
    })

    it('copper electrowinning (undivided, platinum anode)', () => {
      fc.assert(
        fc.property(fc.double({ min: 0.01, max: 2, noNaN: true }), fc.double({ min: 0, max: 2, noNaN: true }), current, hours, eff, (cu, acid, i1, h1, e1) => {
          const p: Protocol = {
            cell: ['compartment bath 2 L', 'anode platinum in bath, area 1 dm^2', 'cathode stainless-steel in bath, area 1 dm^2'],
            charges: { bath: [['CuSO4', cu], ...(acid > 0.001 ? ([['H2SO4', acid]] as Item[]) : []), ['water', 1500]] },
            steps: [`step 1: current ${num(i1)} A for ${num(h1)} h, efficiency ${e1} %`],
          }
          const { s } = run(p)
          expectConserved(chargedElements(p), s, protocolText(p))
          expectEventsInWindows(s, protocolText(p))
          // Faraday's law is an upper bound on the metal: n(Cu) ≤ min(η·Q/(2F), charged Cu).
          const ne = (Number(num(i1)) * Number(num(h1)) * HOUR) / F
          expect(s.deposits.Cu ?? 0).toBeLessThanOrEqual(Math.min((e1 / 100) * ne / 2, Number(num(cu))) * (1 + 1e-9))
        }),
        { numRuns: 40 },
      )
    })
  })
})

// ---- direct simulate() harness -----------------------------------------------------------------

const electrode = (role: 'anode' | 'cathode', comp: string, kind: ElectrodeReaction['kind'], metal?: { element: string; charge: number }): ElectrodeReaction => ({
  role,
  compartment: comp,
  material: 'test',
  kind,
  equation: '',
  reason: 'test',
  ...(metal ? { metal } : {}),
})

function membraneInput(over: Partial<SimInput>): SimInput {
  return {
    compartments: [],
    anode: electrode('anode', 'anolyte', 'chlorine'),
    cathode: electrode('cathode', 'catholyte', 'hydrogen'),
    separator: { type: 'cation-exchange' },
    steps: [],
    temperatureK: 298.15,
    cooled: true,
    targets: [],
    efficiencyFloor: 0,
    ...over,
  }
}

// ---- 2. limiting cases -------------------------------------------------------------------------

describe('limiting cases', () => {
  it("an (almost) ideal membrane: no hydroxide to leak back, small charge → NaOH by Faraday's law within 0.5 %", () => {
    // Catholyte: 1 kg of water and no hydroxide; 0.01 mol e⁻ (1 A for 965.353 3212 s = F/100 C)
    // leaves at most 0.01 mol OH⁻ in ~1 L, 0.01 mol/L, so any back-leak proportional to [OH⁻] is
    // tiny; the chloride anode makes no H⁺ to compete. Expected NaOH = Q/F = 0.01 mol (hand).
    const text = protocolText({
      cell: membrane('mmo-titanium', 'nickel'),
      charges: { anolyte: [['NaCl', 5], ['water', 1500]], catholyte: [['water', 1000]] },
      steps: [`step 1: current 1 A for ${F / 100} s`],
    })
    const s = sim(analyze(text))
    expect(s.mainProduct?.formula).toBe('NaOH')
    const faraday = 0.01 // mol, = (1 A × F/100 s) / F
    expect(Math.abs(s.steps[0].product!.mol / faraday - 1)).toBeLessThan(0.005)
    expect(Math.abs(s.steps[0].product!.efficiency - 1)).toBeLessThan(0.005)
    // The same straight through simulate(), with no hydroxide at the start.
    const r = simulate(
      membraneInput({
        compartments: [
          { name: 'anolyte', waterG: 1500, solutes: [{ formula: 'NaCl', mol: 5 }] },
          { name: 'catholyte', waterG: 1000, solutes: [] },
        ],
        steps: [{ line: 0, currentA: 1, seconds: F / 100, efficiency: 1 }],
      }),
    )
    expect(Math.abs((compartment(r, 'catholyte').species['OH^-'] ?? 0) / faraday - 1)).toBeLessThan(0.005)
  })

  it('zero current changes nothing (simulate() with currentA 0, and a step with no current)', () => {
    const input = membraneInput({
      anode: electrode('anode', 'anolyte', 'oxygen'),
      compartments: [
        { name: 'anolyte', waterG: 800, solutes: [{ formula: 'Na2SO4', mol: 1 }] },
        { name: 'catholyte', waterG: 600, solutes: [{ formula: 'NaOH', mol: 0.1 }] },
      ],
      steps: [
        { line: 3, currentA: 0, seconds: 10 * HOUR, efficiency: 1 },
        { line: 4, seconds: 10 * HOUR, efficiency: 1 },
      ],
    })
    const r = simulate(input)
    expect(r.iterations).toBe(0)
    expect(r.events).toEqual([])
    expect(r.gases).toEqual({})
    expect(r.deposits).toEqual({})
    for (const st of r.steps) expect(st.electronMol).toBe(0)
    // The final state is the charged ions, by hand: 2 Na⁺ + SO4²⁻; 0.1 Na⁺ + 0.1 OH⁻; water g/M.
    const an = compartment(r, 'anolyte').species
    const ca = compartment(r, 'catholyte').species
    expect(an['Na^+']).toBeCloseTo(2, 12)
    expect(an['SO4^2-']).toBeCloseTo(1, 12)
    expect(an.H2O / (800 / M_H2O) - 1).toBeCloseTo(0, 12)
    expect(ca['Na^+']).toBeCloseTo(0.1, 12)
    expect(ca['OH^-']).toBeCloseTo(0.1, 12)
    expect(ca.H2O / (600 / M_H2O) - 1).toBeCloseTo(0, 12)
  })

  it('a soluble copper anode at 100 % keeps the bath copper constant; at 97 % the bath gains exactly (1 − η)·Q/(2F)', () => {
    // Anode: Cu → Cu²⁺ + 2e⁻ for every electron; cathode: η of them deposit Cu, the rest make H2.
    const p = PROTOCOLS['copper plating, copper anode']
    const full = { ...p, steps: ['step 1: current 4 A for 3 h'] }
    const s100 = run(full).s
    const cu0 = 1 // mol Cu²⁺ from 1 mol CuSO4·5H2O
    expect(compartment(s100, 'bath').species['Cu^2+'] / cu0 - 1).toBeCloseTo(0, 9)
    expect(s100.deposits.Cu / ((4 * 3 * HOUR) / F / 2) - 1).toBeCloseTo(0, 9)
    expect(s100.dissolved.Cu / ((4 * 3 * HOUR) / F / 2) - 1).toBeCloseTo(0, 9)
    // 97 % for 2 h at 4 A: Q/F = 28 800 / 96 485.332 12 = 0.298 491 mol e⁻; gain 0.03 × that / 2.
    const s97 = run({ ...p, steps: ['step 1: current 4 A for 2 h, efficiency 97 %'] }).s
    const gain = (0.03 * ((4 * 2 * HOUR) / F)) / 2
    expect((compartment(s97, 'bath').species['Cu^2+'] - cu0) / gain - 1).toBeCloseTo(0, 6)
  })

  it("electrowinning until the copper runs out: all of it deposits, the step's efficiency is n·z·F/Q by hand", () => {
    const { s } = run(PROTOCOLS['copper electrowinning, platinum anode, past the copper'])
    expect(s.deposits.Cu / 0.2 - 1).toBeCloseTo(0, 9)
    // Step 1: Q = 5 A × 3 h = 54 000 C = 0.559 670 56 mol e⁻; 0.2 mol × 2 / 0.559 670 56 = 0.714 706.
    expect(s.steps[0].product!.efficiency / ((0.2 * 2 * F) / (5 * 3 * HOUR)) - 1).toBeCloseTo(0, 9)
    expect(s.steps[1].product!.efficiency).toBe(0)
    // It cannot run out before 99 % of 0.4 mol e⁻ at 95 % has passed: t ≥ 0.99·0.4·F/(0.95·5 A) = 8043.8 s.
    const out = s.events.find((e) => e.kind === 'feed-exhausted')!
    expect(out.time).toBeGreaterThanOrEqual((0.99 * 0.4 * F) / (0.95 * 5) - 1e-6)
    // ... and it is seen by the time 95 % of the current could have deposited it all,
    // 0.4·F/(0.95·5 A) = 8125.3 s, plus the time step in which it happened. Near exhaustion the
    // steps are at most max(2 % of what is left, 1/400 of the step's charge) = 0.0014 mol e⁻ ≈ 27 s
    // (the step-size rule documented in simulate.ts): 1 % (81 s) covers it.
    expect(out.time).toBeLessThanOrEqual(((0.4 * F) / (0.95 * 5)) * 1.01)
  })

  it('the same run written as 500 short steps: each is a small share of the run (one or two time steps), and the copper still runs out on time', () => {
    // With the run's budget (about 1,000 time steps per run) a 36 s step of a 5 h run is taken in one
    // or two time steps: the 2 % rule no longer applies inside it. What must still hold: all the
    // copper deposits, the elements balance, and the exhaustion is seen within the same 1 % window.
    const base = PROTOCOLS['copper electrowinning, platinum anode, past the copper']
    const steps = Array.from({ length: 500 }, (_, i) => `step s${i + 1}: current 5 A for 36 s${i < 300 ? ', efficiency 95 %' : ''}`)
    const p = { ...base, steps }
    const { s } = run(p)
    expect(s.steps).toHaveLength(500)
    expect(s.iterations).toBeLessThan(1000 + 500 + 200)
    expect(s.deposits.Cu / 0.2 - 1).toBeCloseTo(0, 9)
    expectConserved(chargedElements(p), s, '500 short steps')
    const out = s.events.find((e) => e.kind === 'feed-exhausted')!
    expect(out.time).toBeGreaterThanOrEqual((0.99 * 0.4 * F) / (0.95 * 5) - 1e-6)
    expect(out.time).toBeLessThanOrEqual(((0.4 * F) / (0.95 * 5)) * 1.01)
  })
})

// ---- 3. drag at steady state -------------------------------------------------------------------

describe('electro-osmotic drag: the catholyte tends to w = M/(M + M_w·(β − 1))', () => {
  // Per mole of electrons with a cation-exchange membrane and an ideal feed: one Na⁺ crosses and
  // brings β mol water with it; at the cathode H2O + e⁻ → ½H2 + OH⁻ consumes one water and makes
  // one OH⁻. So the catholyte gains 1 mol NaOH and (β − 1) mol water per faraday, and once the
  // added material dominates its mass fraction tends to
  //     w = M(NaOH) / (M(NaOH) + M(H2O)·(β − 1)).
  // With a hydroxide back-leak taking a share ε of the current: (1 − ε) Na⁺ cross with (1 − ε)β
  // water, one water is still consumed per electron, and the net NaOH is (1 − ε); so
  //     1/w = 1 + (β − 1/(1 − ε))·M(H2O)/M(NaOH),
  // which is slightly ABOVE the ideal w (a leak makes the catholyte a little stronger, not weaker).
  // The simulated fraction must lie between w(ε = 0) and w(ε = 0.07): [BREF] gives 94-97 %
  // efficiency at 30-35 wt% NaOH, a loss of at most ~6 %, and the steady states below are 20-31 wt%;
  // 7 % leaves a margin (this is a bracket from the published range, not a fit to the model's leak
  // constant). Margin ±0.1 wt% for the initial catholyte (started at the ideal composition, ≤ 3 %
  // of the final mass) and the time stepping.
  const wOf = (beta: number, eps: number) => 1 / (1 + (beta - 1 / (1 - eps)) * (M_H2O / M_NAOH))

  for (const beta of [6, 10]) {
    it(`β = ${beta}: w between ${(100 * wOf(beta, 0)).toFixed(2)} and ${(100 * wOf(beta, 0.07)).toFixed(2)} wt%`, () => {
      // Feed: NaOH in the anolyte with an oxygen anode (4 OH⁻ → O2 + 2 H2O + 4e⁻): Na⁺ is the only
      // cation, 125 mol of it against 37 mol e⁻, and 1000 mol water against 37·β dragged.
      // Catholyte starts at the ideal steady composition: 1 mol NaOH + (β − 1) mol water.
      const p: Protocol = {
        cell: ['compartment anolyte 30 L', 'compartment catholyte 10 L', `separator cation-exchange between anolyte and catholyte, drag ${beta}`, 'anode platinum in anolyte', 'cathode nickel in catholyte'],
        charges: { anolyte: [['NaOH', 125], ['water', 1000 * M_H2O]], catholyte: [['NaOH', 1], ['water', (beta - 1) * M_H2O]] },
        steps: ['step 1: current 100 A for 10 h'],
      }
      const { s } = run(p)
      expect(s.mainProduct?.formula).toBe('NaOH')
      const w = compartment(s, 'catholyte').main!.wtPercent / 100
      expect(w).toBeGreaterThanOrEqual(wOf(beta, 0) - 0.001)
      expect(w).toBeLessThanOrEqual(wOf(beta, 0.07) + 0.001)
      expect(compartment(s, 'anolyte').species['Na^+']).toBeGreaterThan(50) // the feed never ran low
    })
  }

  it('from below and from above, a long run moves the catholyte toward w, as the mass balance says', () => {
    // Mass balance by hand: n0 mol NaOH in m0 g catholyte, then Ne = I·t/F faradays each adding
    // x·M(NaOH) + (x·β − 1)·M(H2O) grams and x mol NaOH, x = 1 − ε:
    //     w_end = (n0·M + x·Ne·M) / (m0 + x·Ne·M + (x·β − 1)·Ne·M(H2O)).
    // ε is bracketed by [0, 0.07]: [BREF] 94-97 % at 30-35 wt% puts the loss of a real membrane
    // at ≤ 6 % over this range (both starts are ≤ 35 wt%); 7 % for margin. A bracket, not a fit.
    const beta = 8
    const w0 = wOf(beta, 0)
    const Ne = (50 * 10 * HOUR) / F
    for (const startNaOH of [0.2, 4]) {
      // 0.2 mol in 300 g water = 2.6 wt% (below w ≈ 24 wt%); 4 mol in 300 g = 34.8 wt% (above).
      const p: Protocol = {
        cell: ['compartment anolyte 30 L', 'compartment catholyte 10 L', `separator cation-exchange between anolyte and catholyte, drag ${beta}`, 'anode platinum in anolyte', 'cathode nickel in catholyte'],
        charges: { anolyte: [['NaOH', 125], ['water', 1000 * M_H2O]], catholyte: [['NaOH', startNaOH], ['water', 300]] },
        steps: ['step 1: current 50 A for 10 h'],
      }
      const m0 = startNaOH * M_NAOH + 300
      const start = (startNaOH * M_NAOH) / m0
      const wEnd = (eps: number) => {
        const x = 1 - eps
        return (startNaOH * M_NAOH + x * Ne * M_NAOH) / (m0 + x * Ne * M_NAOH + (x * beta - 1) * Ne * M_H2O)
      }
      const { s } = run(p)
      const w = compartment(s, 'catholyte').main!.wtPercent / 100
      // It moved toward the steady state and did not overshoot it.
      if (start < w0) {
        expect(w).toBeGreaterThan(start)
        expect(w).toBeLessThanOrEqual(wOf(beta, 0.07) + 0.001)
      } else {
        expect(w).toBeLessThan(start)
        expect(w).toBeGreaterThanOrEqual(w0 - 0.001)
      }
      const lo = Math.min(wEnd(0), wEnd(0.07))
      const hi = Math.max(wEnd(0), wEnd(0.07))
      expect(w, `start ${start}`).toBeGreaterThanOrEqual(lo - 0.001)
      expect(w, `start ${start}`).toBeLessThanOrEqual(hi + 0.001)
    }
  })

  it(`the default drag (${DEFAULT_DRAG}) is what the separator gets when none is stated`, () => {
    const cell = (more: string) => ['compartment anolyte 30 L', 'compartment catholyte 10 L', `separator cation-exchange between anolyte and catholyte${more}`, 'anode platinum in anolyte', 'cathode nickel in catholyte']
    const charges = { anolyte: [['NaOH', 125], ['water', 1000 * M_H2O]] as Item[], catholyte: [['NaOH', 1], ['water', 200]] as Item[] }
    const steps = ['step 1: current 20 A for 5 h']
    const a = run({ cell: cell(''), charges, steps }).s
    const b = run({ cell: cell(`, drag ${DEFAULT_DRAG}`), charges, steps }).s
    expect(compartment(a, 'catholyte').waterG).toBe(compartment(b, 'catholyte').waterG)
  })
})

// ---- 4. plausibility against industrial figures ------------------------------------------------

describe('membrane chlor-alkali against [BREF]', () => {
  it('a run holding ~32 wt% NaOH shows a step efficiency between 90 % and 99 %', () => {
    // HONESTY NOTE: OH_LEAK_PER_MOLAR was calibrated to this very figure (≈ 4.5 % loss at 32 wt%),
    // so this checks that the calibration survives a full run (densities, transport numbers, H⁺
    // crossing, the anolyte chemistry), not the physics. [BREF]: 94-97 %; the band is widened to
    // 90-99 % because the leak is a linear rule of thumb ("common practice, no source") and the
    // published range spans membranes, current densities and ages.
    //
    // Catholyte at 32.0 wt%: 8 mol NaOH (319.97 g) in 680 g water. Industrial cells hold the
    // catholyte there by adding water; the format cannot add water during a run, so the drag is
    // raised to the steady-state value instead: β = 1 + M(NaOH)(1 − w)/(w·M(H2O)) with w = 0.32
    // = 1 + 39.997·0.68/(0.32·18.015) = 5.72 (hand arithmetic, from the derivation in section 3).
    // Anolyte: 85 mol NaCl in 16 kg water (31 g/100 g, below NaCl's ~38 g/100 g at 85 °C), so the
    // brine stays strong; 30 A for 4 h = 4.48 mol e⁻.
    const beta = 1 + (M_NAOH * 0.68) / (0.32 * M_H2O)
    const p: Protocol = {
      conditions: '85 degC',
      cell: ['compartment anolyte 20 L', 'compartment catholyte 2 L', `separator cation-exchange between anolyte and catholyte, area 1 dm^2, drag ${num(beta)}`, 'anode mmo-titanium in anolyte', 'cathode nickel in catholyte'],
      charges: { anolyte: [['NaCl', 85], ['water', 16000]], catholyte: [['NaOH', 8], ['water', 680]] },
      steps: ['step 1: current 30 A for 4 h'],
      extra: ['handling cooling: cell jacket'],
    }
    const { s } = run(p)
    const w = compartment(s, 'catholyte').main!.wtPercent
    expect(w).toBeGreaterThanOrEqual(30) // [BREF] 30-35 wt%
    expect(w).toBeLessThanOrEqual(35)
    const ce = s.steps[0].product!.efficiency
    console.log(`chlor-alkali at ${w.toFixed(1)} wt% NaOH: simulated CE ${(ce * 100).toFixed(2)} %`)
    expect(ce).toBeGreaterThanOrEqual(0.9)
    expect(ce).toBeLessThanOrEqual(0.99)
  })
})

// ---- 5. monotonicity ---------------------------------------------------------------------------

describe('monotonicity of the hydroxide efficiency', () => {
  // Same charge, same time stepping rules: differences below 1e-6 are the adaptive step sizes
  // landing differently (each run takes its own steps), not chemistry. An acid that raised the
  // efficiency would do so by whole percent.
  const NOISE = 1e-6
  const splitting = (acid: number, naoh: number): Protocol => ({
    cell: membrane('platinum', 'nickel'),
    charges: {
      anolyte: [['Na2SO4', 1], ...(acid > 0 ? ([['H2SO4', acid]] as Item[]) : []), ['water', 800]],
      catholyte: [...(naoh > 0 ? ([['NaOH', naoh]] as Item[]) : []), ['water', 600]],
    },
    steps: ['step 1: current 5 A for 4 h'],
  })
  const ce = (p: Protocol) => {
    const s = run(p).s
    return totalElectrons(s) > 0 ? s.steps.reduce((t, x) => t + x.product!.mol, 0) / totalElectrons(s) : NaN
  }

  it('more H2SO4 in the anolyte never raises it (Na2SO4 feed)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (x, y) => {
        const [lo, hi] = [Math.min(x, y), Math.max(x, y)].map((v) => Number(num(v)))
        expect(ce(splitting(hi, 0.1))).toBeLessThanOrEqual(ce(splitting(lo, 0.1)) + NOISE)
      }),
      { numRuns: 30 },
    )
  })

  it('more NaOH in the starting catholyte never raises it', () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 8, noNaN: true }), fc.double({ min: 0, max: 8, noNaN: true }), (x, y) => {
        const [lo, hi] = [Math.min(x, y), Math.max(x, y)].map((v) => Number(num(v)))
        expect(ce(splitting(0, hi))).toBeLessThanOrEqual(ce(splitting(0, lo)) + NOISE)
      }),
      { numRuns: 30 },
    )
  })

  it('with a K2CO3 feed: more KOH in the starting catholyte never raises it', () => {
    const koh = (n: number): Protocol => ({
      conditions: '30 degC',
      cell: membrane('mmo-titanium', 'nickel'),
      charges: { anolyte: [['K2CO3', 1.3], ['water', 420]], catholyte: [...(n > 0 ? ([['KOH', n]] as Item[]) : []), ['water', 240]] },
      steps: ['step 1: current 5 A for 6 h'],
    })
    fc.assert(
      fc.property(fc.double({ min: 0, max: 3, noNaN: true }), fc.double({ min: 0, max: 3, noNaN: true }), (x, y) => {
        const [lo, hi] = [Math.min(x, y), Math.max(x, y)].map((v) => Number(num(v)))
        expect(ce(koh(hi))).toBeLessThanOrEqual(ce(koh(lo)) + NOISE)
      }),
      { numRuns: 20 },
    )
  })
})

// ---- 6. events ---------------------------------------------------------------------------------

describe('events', () => {
  it('feed exhausted: a K2CO3 feed run long; not before Faraday allows', () => {
    const { s } = run(PROTOCOLS['membrane KOH from K2CO3, run past the feed'])
    const e = s.events.filter((x) => x.kind === 'feed-exhausted')
    expect(e).toHaveLength(1)
    expect(e[0].compartment).toBe('anolyte')
    expectEventsInWindows(s, 'feed')
    // 1.0 mol K⁺ can carry at most 1.0 mol e⁻; 99 % of it gone needs ≥ 0.99·F/5 A = 19 104 s.
    expect(e[0].time).toBeGreaterThanOrEqual((0.99 * 1.0 * F) / 5)
    // The product side then holds all the potassium charged (0.5·2 + 0.1 = 1.1 mol) within 1 %.
    expect(compartment(s, 'catholyte').species['K^+']).toBeGreaterThan(0.99 * 1.1)
  })

  it('saturation: KHCO3 forms from K2CO3 at 20 °C and crystallises; the solution stays at [PERRY] solubility', () => {
    const p: Protocol = {
      conditions: '20 degC',
      cell: membrane('mmo-titanium', 'nickel'),
      charges: { anolyte: [['K2CO3', 1.3], ['water', 420]], catholyte: [['KOH', 0.1], ['water', 240]] },
      steps: ['step 1: current 5 A for 6 h', 'step 2: current 3 A for 1 h'],
    }
    const { s } = run(p)
    const e = s.events.filter((x) => x.kind === 'saturated')
    expect(e.map((x) => x.message).join()).toMatch(/KHCO/)
    expectEventsInWindows(s, 'KHCO3')
    const feed = compartment(s, 'anolyte')
    expect(feed.solids.KHCO3).toBeGreaterThan(0)
    // Dissolved KHCO3 at the end: min(K⁺, HCO3⁻) ≤ 33.2 g/100 g × water / M(KHCO3) (+1e-6 relative).
    const dissolved = Math.min(feed.species['K^+'], feed.species['HCO3^-'])
    expect(dissolved).toBeLessThanOrEqual(((KHCO3_SOL_20C * feed.waterG) / 100 / M_KHCO3) * (1 + 1e-6))
  })

  it('saturation: a salt concentrated by drag (Na2SO4, drag 8)', () => {
    const { s } = run(PROTOCOLS['salt driven past saturation'])
    expect(s.events.some((x) => x.kind === 'saturated' && /Na/.test(x.message) && x.compartment === 'anolyte')).toBe(true)
    expectEventsInWindows(s, 'Na2SO4')
  })

  const kohTarget = (steps: string[]): Protocol => ({
    conditions: '30 degC',
    cell: membrane('mmo-titanium', 'nickel'),
    charges: { anolyte: [['K2CO3', 1.3], ['water', 420]], catholyte: [['KOH', 0.1], ['water', 240]] },
    steps,
    extra: ['expect KOH 20 wt% in catholyte'],
  })
  const targetHint = (a: Analysis) => a.computed.find((c) => c.key === 'expect.target')?.label

  it('target reached: a long run says so on the expect line, at a time inside the step that reached it', () => {
    const { a, s } = run(kohTarget(['step 1: current 5 A for 4 h', 'step 2: current 5 A for 4 h']))
    expect(targetHint(a)).toMatch(/reached after/)
    const e = s.events.filter((x) => x.kind === 'target-reached')
    expect(e).toHaveLength(1)
    expectEventsInWindows(s, 'target')
    expect(compartment(s, 'catholyte').main!.wtPercent).toBeGreaterThanOrEqual(20)
    // The step it names is the one whose snapshots cross 20 wt%: below before it, at or above after.
    const i = s.steps.findIndex((x) => x.line === e[0].line)
    const wt = (k: number) => s.steps[k].compartments.find((c) => c.name === 'catholyte')!.main!.wtPercent
    const before = i === 0 ? (100 * 0.1 * M_KOH) / (0.1 * M_KOH + 240) : wt(i - 1)
    expect(before).toBeLessThan(20)
    expect(wt(i)).toBeGreaterThanOrEqual(20)
  })

  it('target not reached: a run too short by Faraday alone', () => {
    // 1 A for 10 min = 600 C = 0.006 22 mol e⁻ → at most 0.006 22 mol KOH = 0.349 g on top of
    // 0.1 mol (5.61 g) in 240 g water: at most (5.61 + 0.35)/(245.6 − 0.11) ≈ 2.4 wt% < 20 wt%,
    // whatever the water transport does (drag only adds water).
    const { a, s } = run(kohTarget(['step 1: current 1 A for 10 min']))
    expect(targetHint(a)).toMatch(/not reached/)
    expect(s.events.some((x) => x.kind === 'target-reached')).toBe(false)
    const bound = (100 * (0.1 * M_KOH + ((1 * 600) / F) * M_KOH)) / (0.1 * M_KOH + 240 - ((1 * 600) / F) * M_H2O)
    expect(compartment(s, 'catholyte').main!.wtPercent).toBeLessThan(bound)
  })

  it('pH crossing: the anolyte of Na2SO4 splitting turns acidic during the step', () => {
    const { s } = run(PROTOCOLS['Na2SO4 splitting, cation-exchange'])
    const e = s.events.filter((x) => x.kind === 'ph' && x.compartment === 'anolyte')
    expect(e.length).toBeGreaterThanOrEqual(1)
    expect(e[0].message).toMatch(/acid/)
    expectEventsInWindows(s, 'ph')
    expect(compartment(s, 'anolyte').ph).toBeLessThan(7)
  })

  it('efficiency below the floor: reported with floor 0.99, not with the default 0.8, at the end of the step', () => {
    const p = PROTOCOLS['chlor-alkali membrane']
    const strict = run(p, { efficiencyFloor: 0.99 }).s
    const ce = strict.steps[0].product!.efficiency
    expect(ce).toBeLessThan(0.99)
    expect(ce).toBeGreaterThan(0.8)
    const e = strict.events.filter((x) => x.kind === 'efficiency')
    expect(e).toHaveLength(1)
    expect(e[0].line).toBe(strict.steps[0].line)
    expect(e[0].time).toBe(strict.steps[0].endTime)
    expect(run(p).s.events.some((x) => x.kind === 'efficiency')).toBe(false)
  })

  it('every event of every protocol lies on the step line and in the time window it happened in', () => {
    for (const [name, p] of Object.entries(PROTOCOLS)) expectEventsInWindows(run(p, { efficiencyFloor: 0.99 }).s, name)
  })
})

// ---- 7. cost -----------------------------------------------------------------------------------

describe('cost', () => {
  // The time is measured by `npm run bench` (a benchmark, not a timed test); what is checked here
  // is the work the simulation does, which is what makes it cheap enough for every keystroke.
  it('a 10-step, 24-hour membrane run takes fewer than 5,000 time steps and still ends at 24 h', () => {
    const p: Protocol = {
      conditions: '30 degC',
      cell: membrane('mmo-titanium', 'nickel'),
      charges: { anolyte: [['K2CO3', 5.2], ['water', 1400]], catholyte: [['KOH', 0.36], ['water', 800]] },
      steps: Array.from({ length: 10 }, (_, i) => `step s${i + 1}: current 5 A for 2 h 24 min`),
      extra: ['expect KOH 30 wt% in catholyte'],
    }
    const s = sim(analyze(protocolText(p)))
    expect(s.steps.at(-1)!.endTime).toBeCloseTo(24 * HOUR, 6)
    expect(s.iterations).toBeLessThan(5000)
  })

  it('a run of 1,000 short steps costs about as much as one of ten: at most ~1,000 time steps plus one per step', () => {
    const p: Protocol = {
      conditions: '30 degC',
      cell: membrane('mmo-titanium', 'nickel'),
      charges: { anolyte: [['K2CO3', 5.2], ['water', 1400]], catholyte: [['KOH', 0.36], ['water', 800]] },
      steps: Array.from({ length: 1000 }, (_, i) => `step s${i + 1}: current 5 A for 86.4 s`),
    }
    const s = sim(analyze(protocolText(p)))
    expect(s.steps).toHaveLength(1000)
    expect(s.steps.at(-1)!.endTime).toBeCloseTo(24 * HOUR, 3)
    expect(s.iterations).toBeLessThan(1000 + 1000 + 200)
    // Coarser time steps must not change the outcome: the same 120 A·h in one step gives the same
    // hydroxide within 1 % (the physics does not know how the protocol splits the run).
    const one = sim(analyze(protocolText({ ...p, steps: ['step all: current 5 A for 24 h'] })))
    const koh = (r: typeof s) => r.final.find((c) => c.name === 'catholyte')!.species['OH^-']
    expect(Math.abs(koh(s) - koh(one)) / koh(one)).toBeLessThan(0.01)
  })
})

// ---- regressions -----------------------------------------------------------------------------

describe('regressions (found in review, fixed)', () => {
  it('carbonate and acid charged together keep their carbon: the CO2 is released at load', () => {
    // load() equilibrates with no gas ledger: H⁺ + CO3²⁻ → HCO3⁻, H⁺ + HCO3⁻ → CO2 + H2O, and the
    // CO2 disappears. Charged: 1 mol K2CO3 → 1 mol C. With no current nothing else can happen.
    const r = simulate(
      membraneInput({
        anode: electrode('anode', 'anolyte', 'oxygen'),
        compartments: [
          { name: 'anolyte', waterG: 500, solutes: [{ formula: 'K2CO3', mol: 1 }, { formula: 'H2SO4', mol: 1 }] },
          { name: 'catholyte', waterG: 500, solutes: [] },
        ],
        steps: [{ line: 0, currentA: 0, seconds: 10, efficiency: 1 }],
      }),
    )
    expect(inventory(r).elements.C ?? 0).toBeCloseTo(1, 9)
  })

  it('an anolyte is never dragged dry, and precipitation invents nothing', () => {
    // 0.1 mol NaCl in 900 g (49.96 mol) water; 16.86 A for 20 h = 12.58 mol e⁻. Each electron
    // drags 3.5 water through the membrane with the cation that carries it (Na⁺, then H⁺) and the
    // oxygen anode splits ½ water: ≈ 4 × 12.58 = 50 mol, the whole anolyte. Observed: anolyte
    // water −0.0063 g, mass and volume negative, a negative wt%, and 4e-5 mol of solid NaCl made
    // from nothing (precipitate() with a negative water mass drives Na⁺ and Cl⁻ below zero, and
    // the snapshot hides negative amounts), so Na and Cl are no longer conserved.
    const p: Protocol = {
      conditions: '60 degC',
      cell: membrane('mmo-titanium', 'nickel'),
      charges: { anolyte: [['NaCl', 0.1], ['water', 900]], catholyte: [['water', 700]] },
      steps: ['step 1: current 0.05 A for 0.05 h, efficiency 1 %', 'step 2: current 16.861635 A for 19.999999 h'],
    }
    const { s } = run(p)
    for (const c of s.final) {
      expect(c.waterG, c.name).toBeGreaterThanOrEqual(0)
      expect(c.massG, c.name).toBeGreaterThanOrEqual(0)
    }
    expectConserved(chargedElements(p), s, 'dry anolyte')
  })

  it('a diaphragm cell does not count hydroxide that mixes over from the anolyte as formed by the current', () => {
    // 0.7 mol KOH charged in the anolyte, plain water in the catholyte, 0.1 A for 7 h = 0.0261 mol e⁻.
    // The diaphragm mixing (mix()) carries charged KOH into the catholyte, and the efficiency
    // measure (catholyte OH⁻ gained × z ÷ electrons) counts it: the step reports a current
    // efficiency of several hundred percent, which Faraday's law forbids (≤ 100 %).
    const p: Protocol = {
      cell: membrane('nickel', 'nickel', 'diaphragm'),
      charges: { anolyte: [['KOH', 0.7], ['water', 1000]], catholyte: [['water', 1000]] },
      steps: ['step 1: current 0.1 A for 7 h'],
    }
    const { s } = run(p)
    expect(s.steps[0].product!.efficiency).toBeLessThanOrEqual(1 + 1e-9)
  })

  it('a salt that crystallised redissolves when its solution falls below saturation', () => {
    // K2SO4 at 20 °C: 11.11 g/100 g water [PERRY, from memory], i.e. 500 g water hold 55.6 g =
    // 0.319 mol (M = 174.26 g/mol, IUPAC). Charge 1 mol, pass 5 A for 12 h (2.24 mol e⁻): the K⁺
    // leaves through the membrane and the solution empties, but the solid stays forever.
    const r = simulate(
      membraneInput({
        anode: electrode('anode', 'anolyte', 'oxygen'),
        temperatureK: 293.15,
        compartments: [
          { name: 'anolyte', waterG: 500, solutes: [{ formula: 'K2SO4', mol: 1 }] },
          { name: 'catholyte', waterG: 500, solutes: [] },
        ],
        steps: [{ line: 0, currentA: 5, seconds: 12 * HOUR, efficiency: 1 }],
      }),
    )
    const feed = compartment(r, 'anolyte')
    const solid = feed.solids.K2SO4 ?? 0
    const dissolved = Math.min((feed.species['K^+'] ?? 0) / 2, feed.species['SO4^2-'] ?? 0)
    const limit = (11.11 * feed.waterG) / 100 / (2 * 39.0983 + 32.06 + 4 * 15.999)
    // Equilibrium: either no solid left, or the solution is saturated (within 1 %).
    expect(solid === 0 || dissolved >= 0.99 * limit).toBe(true)
  })
})
