/** The index page of a batch: one row per session, failed sessions first, each linking its report. */
import type { BatchIndexData } from './report-data.js';
import { cautionsHtml, pageHtml } from './session-report.js';
import { esc } from './svg-kit.js';
import { badge, table } from './tables.js';

/** Failed sessions first, then those with another status than ok, then the rest; by name within each. */
export function batchOrder<T extends { readonly status: string; readonly session: string }>(sessions: readonly T[]): T[] {
  const rank = (s: string) => (s === 'failed' ? 0 : s === 'ok' ? 2 : 1);
  return [...sessions].sort((a, b) => rank(a.status) - rank(b.status) || a.session.localeCompare(b.session));
}

export function buildBatchIndexHtml(d: BatchIndexData): string {
  const sessions = batchOrder(d.sessions);
  const failed = sessions.filter((s) => s.status === 'failed').length;
  // Processed sessions with a problem (e.g. 'incomplete-input'): listed after the failed ones, before the rest.
  const flagged = sessions.filter((s) => s.status !== 'ok' && s.status !== 'failed').length;
  const rows = sessions.map((s) => [
    s.reportHref ? `<a href="${esc(s.reportHref)}">${esc(s.session)}</a>` : esc(s.session),
    badge(s.status), s.epochs > 0 ? String(s.epochs) : '', s.epochs > 0 ? `${((100 * s.solvedEpochs) / s.epochs).toFixed(1)}&nbsp;%` : '', String(s.points), esc(s.reason),
  ]);
  const body = `<header><h1>Batch report: ${esc(d.title)}</h1><p class="sub">${esc(d.software)}, made ${esc(d.createdUtc)}</p></header>` +
    cautionsHtml(d.cautions) +
    `<h2>Sessions</h2><p>${sessions.length} session(s), ${failed || flagged ? [failed ? `${failed} failed` : '', flagged ? `${flagged} with a status other than ok` : ''].filter((t) => t).join(', ') + ' (listed first)' : 'all ok'}.</p>` +
    table(['session', 'status', 'epochs', 'solved', 'points', 'reason'], rows, [0, 1, 5]).replace('<table>', '<table class="sessions">') +
    `<footer>Each session's page is in its own folder beside this one.</footer>`;
  return pageHtml(`${d.title}: batch report`, body);
}
