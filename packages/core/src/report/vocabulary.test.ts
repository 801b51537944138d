import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { GNSS_SYSTEMS } from '../gnss/index.js';
import { VOCABULARY } from './vocabulary.js';
import { epochTableColumns } from './epoch-table.js';
import { RESIDUAL_COLUMNS } from './residual-rows.js';
import { pointsColumns } from './points-table.js';
import { CONTROL_CHECK_COLUMNS } from './control-report.js';

const DOC = fileURLToPath(new URL('../../../../docs/outputs.md', import.meta.url));

describe('one output vocabulary, documented once', () => {
  it('every column of every table is in the vocabulary', () => {
    const all = [...epochTableColumns(GNSS_SYSTEMS), ...RESIDUAL_COLUMNS, ...pointsColumns(), ...CONTROL_CHECK_COLUMNS];
    for (const c of all) expect(VOCABULARY[c], c).toBeDefined();
  });
  it('docs/outputs.md lists exactly the vocabulary, with the same units and meanings', () => {
    const rows = readFileSync(DOC, 'utf8').split('\n').filter((l) => l.startsWith('| `'));
    const doc = new Map(rows.map((l) => {
      const cells = l.slice(2, -2).split(/ (?<!\\)\| /).map((x) => x.trim());
      return [cells[0]!.replace(/`/g, ''), { unit: cells[1] || null, meaning: cells[2]!.replace(/\\\|/g, '|') }];
    }));
    expect([...doc.keys()]).toEqual(Object.keys(VOCABULARY));
    for (const [k, v] of Object.entries(VOCABULARY)) expect(doc.get(k), k).toEqual({ unit: v.unit, meaning: v.meaning });
  });
});
