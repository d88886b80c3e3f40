// The acknowledgement comment, `# noted CODE: reason`, shared by the analysis and its rule.
export const NOTED_ANY = /^#\s*noted\s+([A-Za-z0-9-]+)\s*(?::\s*(.*))?$/
