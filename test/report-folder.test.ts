/**
 * `refdelta report DIR` reads output files by column name: without the '#' preamble, with columns in
 * another order, a few renamed and new ones appended, and with files missing. Hand-made files whose
 * expected values are written beside them; the local east/north/up of a point 100 m east of the
 * reference at latitude 0, longitude 0 is (0, 100, 0) ECEF -> (100, 0, 0) ENU (ENU rotation, any geodesy text).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readSessionReportData, sourcesInFolder } from '../packages/cli/src/report-folder.js';
import { expectOneSentence, requireBuiltCli, runCli, tempDir } from './cli-support.js';

const A = 6378137; // WGS-84 semi-major axis (NIMA TR8350.2): a point on the equator at longitude 0 is (a, 0, 0)

describe('report data read by column name', () => {
  it('no preamble, reordered/renamed/appended columns, no residuals: what is there is read, what is missing is said', async () => {
    const dir = tempDir('rd-report-cols-');
    writeFileSync(join(dir, 'epochs.csv'), [
      'solution_kind,gps_tow_s,gps_week,ecef_x_m,ecef_y_m,ecef_z_m,satellites_used,pdop,point,new_column_at_the_end',
      `fixed,0,2000,${A},100,0,9,1.5,P1,x`,
      `float,1,2000,${A},101,0,9,1.6,P1,y`,
      'none,2,2000,,,,0,,,z',
    ].join('\n') + '\n');
    writeFileSync(join(dir, 'summary.json'), JSON.stringify({ reference: { position: { x_m: A, y_m: 0, z_m: 0 } }, frame: { name: 'ITRF2014', epoch_text: '2018.76' } }));
    const d = await readSessionReportData(sourcesInFolder(dir), 't');
    expect(d.frameText).toBe('ITRF2014 epoch 2018.76');
    expect(Array.from(d.epochs!.kind)).toEqual(['fixed', 'float', 'none']);
    expect(d.epochs!.timeGpsS[1] - d.epochs!.timeGpsS[0]).toBe(1);
    expect(d.epochs!.timeGpsS[0]).toBe(2000 * 604800);
    expect(d.epochs!.eastM[0]).toBeCloseTo(100, 6);
    expect(d.epochs!.eastM[1]).toBeCloseTo(101, 6);
    expect(d.epochs!.northM[0]).toBeCloseTo(0, 6);
    expect(Number.isNaN(d.epochs!.eastM[2])).toBe(true);
    expect(d.residuals).toBeNull();
    expect(d.missing.join(' ')).toMatch(/No residuals.csv/);
  });

  it("'#' preamble lines are skipped, quoted reasons are read, rejection reasons grouped by their words", async () => {
    const dir = tempDir('rd-report-res-');
    writeFileSync(join(dir, 'residuals.csv'), [
      '# a comment line', '# another',
      'gps_week,gps_tow_s,satellite,signal,elevation_deg,azimuth_deg,residual_m,weight_per_m2,w_test,status,reason',
      '2000,0,G01,C1C,45,90,0.5,1,0.1,used,',
      '2000,0,G02,C1C,7.7,10,,,,rejected,below elevation mask (7.7 deg)',
      '2000,1,G02,C1C,7.8,10,,,,rejected,below elevation mask (7.8 deg)',
      '2000,1,G03,C1C,30,200,,,,rejected,"rejected by data snooping (w = 35.2, critical 3.29)"',
    ].join('\n') + '\n');
    const d = await readSessionReportData(sourcesInFolder(dir), 't');
    expect(d.residuals!.satellites).toEqual(['G01', 'G02', 'G03']);
    expect(d.residuals!.reasons).toEqual(['below elevation mask', 'rejected by data snooping']);
    expect(Array.from(d.residuals!.rejection)).toEqual([0, 1, 1, 2]);
    expect(d.missing.join(' ')).toMatch(/No epochs.csv/);
  });

  it('a folder with none of the outputs: exit 1 and one sentence naming it', () => {
    requireBuiltCli();
    const dir = tempDir('rd-report-empty-');
    mkdirSync(join(dir, 'sub'));
    const r = runCli(['report', dir]);
    expect(r.status).toBe(1);
    expect(expectOneSentence(r)).toMatch(/holds none of the outputs/);
  });
});
