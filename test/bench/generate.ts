// Generated protocols for the benchmark and the scaling tests: a membrane cell (a scenario of our
// own, invented numbers) followed by as many shift blocks as it takes to reach the line count. Each
// block has notes, a named value, a step, observations, a comment and a blank line, so the parser,
// the expression evaluator, the engine, the simulation and the rules all get their share.
//
// The same content is also written as YAML, line for line (one list item per protocol statement),
// for the comparison with the `yaml` package in `npm run bench`.

export interface Generated {
  text: string
  yaml: string
  lines: number
  steps: number
}

const HEADER = [
  '# Generated for the benchmark: potassium hydroxide from carbonate, long campaign.',
  'run "Generated campaign"',
  'note Two-compartment cell, PP frame, both sides recirculated.',
  'conditions 30 degC, 101.325 kPa',
  '',
  'let area = 200 cm^2',
  'let j = 100 mA/cm^2',
  '',
  'cell',
  '  vessel polypropylene',
  '  compartment feed 20 L',
  '  compartment product 10 L',
  '  separator cation-exchange between feed and product, area area',
  '  anode mmo-titanium in feed, area area',
  '  cathode nickel in product, area area',
  '',
  'charge feed: K2CO3 7.2 kg, water 16.8 L',
  'charge product: KOH 200 g, water 9.6 L',
  '',
]

const HEADER_YAML = [
  '# Generated for the benchmark: potassium hydroxide from carbonate, long campaign.',
  '- run: "Generated campaign"',
  '- note: Two-compartment cell, PP frame, both sides recirculated.',
  '- conditions: [30 degC, 101.325 kPa]',
  '',
  '- let: { name: area, value: 200 cm^2 }',
  '- let: { name: j, value: 100 mA/cm^2 }',
  '',
  '- cell:',
  '    vessel: polypropylene',
  '    compartments:',
  '      - { name: feed, volume: 20 L }',
  '      - { name: product, volume: 10 L }',
  '    separator: { type: cation-exchange, between: [feed, product], area: area }',
  '    anode: { material: mmo-titanium, in: feed, area: area }',
  '    cathode: { material: nickel, in: product, area: area }',
  '',
  '- charge: { compartment: feed, items: [K2CO3 7.2 kg, water 16.8 L] }',
  '- charge: { compartment: product, items: [KOH 200 g, water 9.6 L] }',
  '',
]

const FOOTER = [
  'handling vent: product-side hydrogen piped to the hood exhaust, no ignition sources nearby',
  'handling hood: feed-side off-gas (O2 and CO2) released inside the fume hood',
  'handling ppe: face shield, nitrile gloves and apron when sampling the caustic product',
]

const FOOTER_YAML = [
  '- handling: { type: vent, text: "product-side hydrogen piped to the hood exhaust, no ignition sources nearby" }',
  '- handling: { type: hood, text: "feed-side off-gas (O2 and CO2) released inside the fume hood" }',
  '- handling: { type: ppe, text: "face shield, nitrile gloves and apron when sampling the caustic product" }',
]

const BLOCK_LINES = 10

/**
 * A protocol of about `lines` lines (exactly, for lines >= 32). The whole campaign lasts 48 h at
 * about 20 A whatever its length, so every size describes the same chemistry in finer steps.
 */
export function generateProtocol(lines: number): Generated {
  const blocks = Math.max(1, Math.floor((lines - HEADER.length - FOOTER.length) / BLOCK_LINES))
  const minutes = (48 * 60) / blocks
  const body: string[] = [...HEADER]
  const yaml: string[] = [...HEADER_YAML]
  for (let b = 1; b <= blocks; b++) {
    const j = 90 + (b % 11)
    const dur = `${minutes.toPrecision(4)} min`
    body.push(
      `# shift ${b}: sample both sides, log the cell voltage`,
      `note Shift ${b}: top up the product side with water if the level drops below the mark.`,
      `let j${b} = ${j} mA/cm^2`,
      `step s${b}: current j${b} * area for ${dur}, efficiency ${90 + (b % 7)} %`,
      `observe KOH ${(200 + b * 0.9).toFixed(1)} g in product  # titration, 1 M HCl`,
      b % 3 === 0 ? `expect H2 ${(b * 0.2).toFixed(1)} L in product` : `note Feed temperature ${28 + (b % 5)} degC, pumps at setting ${b % 9}.`,
      `note Sample ${b}a taken from the feed, ${5 + (b % 4)} mL, for carbonate by titration.`,
      `note Sample ${b}b taken from the product, 5 mL, for hydroxide by titration.`,
      `note Cell voltage and temperature logged every ${b % 2 ? 10 : 15} min.`,
      '',
    )
    yaml.push(
      `# shift ${b}: sample both sides, log the cell voltage`,
      `- note: "Shift ${b}: top up the product side with water if the level drops below the mark."`,
      `- let: { name: j${b}, value: ${j} mA/cm^2 }`,
      `- step: { label: s${b}, current: j${b} * area, for: ${dur}, efficiency: ${90 + (b % 7)} % }`,
      `- observe: { species: KOH, amount: ${(200 + b * 0.9).toFixed(1)} g, in: product }  # titration, 1 M HCl`,
      b % 3 === 0 ? `- expect: { species: H2, amount: ${(b * 0.2).toFixed(1)} L, in: product }` : `- note: Feed temperature ${28 + (b % 5)} degC, pumps at setting ${b % 9}.`,
      `- note: Sample ${b}a taken from the feed, ${5 + (b % 4)} mL, for carbonate by titration.`,
      `- note: Sample ${b}b taken from the product, 5 mL, for hydroxide by titration.`,
      `- note: Cell voltage and temperature logged every ${b % 2 ? 10 : 15} min.`,
      '',
    )
  }
  while (body.length + FOOTER.length < lines) {
    body.push('')
    yaml.push('')
  }
  body.push(...FOOTER)
  yaml.push(...FOOTER_YAML)
  return { text: body.join('\n') + '\n', yaml: yaml.join('\n') + '\n', lines: body.length, steps: blocks }
}
