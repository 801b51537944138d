/** Readable text views of the inspection results (the JSON is the primary layout). */
import type { ObsInspection } from './inspect-obs.js';
import type { NavInspection } from './inspect-nav.js';

function kv(label: string, value: string): string {
  return `  ${label.padEnd(22)} ${value}`;
}

export function obsInspectionText(r: ObsInspection): string {
  const out: string[] = [];
  out.push(`${r.file}`);
  out.push(kv('format', `${r.format.name} ${r.format.version}${r.format.encoding_layers.length ? ` (${r.format.encoding_layers.join(' > ')})` : ''}`));
  out.push(kv('marker', `${r.station.marker_name || '-'}${r.station.marker_number ? ` (${r.station.marker_number})` : ''}`));
  out.push(kv('receiver', `${r.station.receiver_type || '-'} #${r.station.receiver_number || '-'}${r.station.receiver_version ? ` fw ${r.station.receiver_version}` : ''}`));
  out.push(kv('antenna', `${r.station.antenna_type || '-'} #${r.station.antenna_number || '-'}; delta H/E/N ${r.station.antenna_delta_hen_m.map((x) => x.toFixed(4)).join(' / ')} m`));
  if (r.approx_position) {
    const p = r.approx_position;
    out.push(kv('approx position', `${p.x_m.toFixed(4)} ${p.y_m.toFixed(4)} ${p.z_m.toFixed(4)} m (ECEF)`));
    out.push(kv('', `${p.latitude_deg.toFixed(8)} ${p.longitude_deg.toFixed(8)} deg, h ${p.height_m.toFixed(3)} m (frame not stated)`));
  } else {
    out.push(kv('approx position', 'none'));
  }
  out.push(kv('time system', r.time_system));
  if (r.time_span) {
    out.push(kv('first epoch', `${r.time_span.first.gps} GPS (${r.time_span.first.utc}); week ${r.time_span.first.gps_week} tow ${r.time_span.first.gps_tow_s} s`));
    out.push(kv('last epoch', `${r.time_span.last.gps} GPS (${r.time_span.last.utc}); week ${r.time_span.last.gps_week} tow ${r.time_span.last.gps_tow_s} s`));
    out.push(kv('duration', `${r.time_span.duration_s} s`));
  } else {
    out.push(kv('time span', 'no epochs'));
  }
  out.push(kv('interval', `nominal ${r.interval.nominal_s === null || r.interval.nominal_s === undefined ? 'not stated' : `${r.interval.nominal_s} s`}, detected ${r.interval.detected_s === null || r.interval.detected_s === undefined ? '-' : `${r.interval.detected_s} s`}`));
  out.push(kv('epochs', `${r.epochs.observation} with observations; by flag ${Object.entries(r.epochs.by_flag).map(([f, n]) => `${f}:${n}`).join(' ')}`));
  out.push(kv('gaps', `${r.gaps.count} longer than ${r.gaps.threshold_s ?? '-'} s, ${r.gaps.total_s} s in all`));
  for (const g of r.gaps.list.slice(0, 20)) out.push(kv('', `${g.start.gps} -> ${g.end.gps} (${g.length_s} s)`));
  if (r.gaps.list.length > 20 || r.gaps.list_truncated) out.push(kv('', `... (see the JSON view for the full list)`));
  out.push(kv('satellites', `${r.satellites.total}`));
  for (const [sys, s] of Object.entries(r.satellites.per_system)) {
    const sats = Object.entries(s.epochs_per_satellite).map(([k, n]) => `${k}:${n}`).join(' ');
    out.push(kv(`  ${s.name} (${sys})`, `${s.count}: ${sats}`));
  }
  out.push(kv('observation types', ''));
  for (const [sys, t] of Object.entries(r.observation_types)) {
    const same = t.rinex3.join(' ') === t.as_written.join(' ');
    out.push(kv(`  ${sys}`, same ? t.rinex3.join(' ') : `${t.as_written.join(' ')}  (as ${t.rinex3.join(' ')})`));
  }
  out.push(kv('events', `${r.events.count}`));
  for (const e of r.events.list.slice(0, 20)) out.push(kv('', `line ${e.line}: flag ${e.flag} ${e.meaning}${e.time ? ` at ${e.time.gps}` : ''}${e.marker ? ` marker ${e.marker}` : ''}`));
  out.push(kv('problems', `${r.problems.count}`));
  for (const p of r.problems.list.slice(0, 20)) out.push(kv('', `${p.line ? `line ${p.line}: ` : ''}${p.message}`));
  return out.join('\n') + '\n';
}

export function navInspectionText(r: NavInspection): string {
  const out: string[] = [];
  out.push(r.files.join(', '));
  out.push(kv('format', `${r.format.name} ${r.format.version}${r.format.encoding_layers.length ? ` (${r.format.encoding_layers.join(' > ')})` : ''}`));
  out.push(kv('records', String(r.records)));
  if (r.time_span) out.push(kv('reference times', `${r.time_span.first.gps} -> ${r.time_span.last.gps} GPS`));
  for (const [sys, s] of Object.entries(r.per_system)) {
    const msgs = Object.entries(s.messages).map(([m, n]) => `${m}:${n}`).join(' ');
    out.push(kv(`  ${s.name} (${sys})`, `${s.records} records, ${s.satellites} satellites, ${s.unhealthy_records} unhealthy; ${msgs}`));
  }
  out.push(kv('ionosphere', r.ionosphere.length ? r.ionosphere.join(', ') : 'none'));
  out.push(kv('leap seconds', r.leap_seconds === null ? 'not stated' : String(r.leap_seconds)));
  if (r.time_offsets.length) out.push(kv('time offsets', r.time_offsets.join(' ')));
  out.push(kv('problems', String(r.problems.count)));
  for (const p of r.problems.list.slice(0, 20)) out.push(kv('', `${p.line ? `line ${p.line}: ` : ''}${p.message}`));
  return out.join('\n') + '\n';
}
