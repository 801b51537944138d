import { describe, expect, it } from 'vitest';
import { readObsStream, collectEpochs } from './obs-reader.js';
import { programDateSeconds } from './obs-header.js';
import { secondsFromCalendar } from '../time/index.js';
import type { Warning } from '../errors.js';

const pad = (s: string, label: string) => s.padEnd(60) + label;

function header(pgmDate: string, firstObs: string, leap: string): string {
  return [
    pad('     3.04           OBSERVATION DATA    G', 'RINEX VERSION / TYPE'),
    pad(`testgen             lab                 ${pgmDate}`, 'PGM / RUN BY / DATE'),
    pad('MARK', 'MARKER NAME'),
    pad('  4000000.0000  1000000.0000  4800000.0000', 'APPROX POSITION XYZ'),
    pad('        0.0000        0.0000        0.0000', 'ANTENNA: DELTA H/E/N'),
    pad('G    1 C1C', 'SYS / # / OBS TYPES'),
    pad(firstObs, 'TIME OF FIRST OBS'),
    pad(leap, 'LEAP SECONDS'),
    pad('', 'END OF HEADER'),
    '> 1999 08 22 00 00  0.0000000  0  1',
    'G01  20000000.000',
    '',
  ].join('\n');
}

async function* once(t: string) { yield t; }

describe('observation header dates', () => {
  it('warns when the data are dated 1024 weeks before the file was made (receiver week rollover)', async () => {
    // IS-GPS-200 20.3.3.3.1.1: the broadcast week is 10 bits, so a faulty receiver is off by 1024 weeks.
    // 1999-08-22 + 1024 weeks = 2019-04-07 (the second GPS week rollover; USNO GPS time notes).
    const warnings: Warning[] = [];
    const st = await readObsStream('roll.rnx', once(header('20190410 120000 UTC', '  1999    08    22    00    00    0.0000000     GPS', '    18')), { onWarning: (w) => warnings.push(w) });
    await collectEpochs(st);
    expect(warnings.some((w) => w.code === 'week-rollover')).toBe(true);
  });
  it('no warning for an ordinary file', async () => {
    const warnings: Warning[] = [];
    const st = await readObsStream('ok.rnx', once(header('19990822 120000 UTC', '  1999    08    22    00    00    0.0000000     GPS', '    13')), { onWarning: (w) => warnings.push(w) });
    await collectEpochs(st);
    expect(warnings.filter((w) => w.code === 'week-rollover')).toEqual([]);
    expect(st.header.leapSeconds).toBe(13);
  });
  it('LEAP SECONDS marked BDS give BDT - UTC: GPS - UTC is 14 s more', async () => {
    // RINEX 3.04 LEAP SECONDS record, time system field; BDT = GPST - 14 s (BeiDou ICD; check-values.md)
    const st = await readObsStream('bds.rnx', once(header('20190410 120000 UTC', '  2019    04    10    00    00    0.0000000     GPS', '     4     4  2045     3BDS')));
    expect(st.header.leapSeconds).toBe(18);
  });
  it('reads both program-date layouts', () => {
    expect(programDateSeconds('20181004 123716 GPS')).toBe(secondsFromCalendar({ year: 2018, month: 10, day: 4, hour: 12, minute: 37, second: 16 }));
    expect(programDateSeconds('04-OCT-18 12:37')).toBe(secondsFromCalendar({ year: 2018, month: 10, day: 4, hour: 12, minute: 37, second: 0 }));
    expect(programDateSeconds('garbage')).toBeNull();
  });
});
