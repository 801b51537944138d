/**
 * A clearer sentence for yargs' "Unknown argument(s): a, b" (its strict mode lists each unknown option
 * twice, as typed and in camel case): each unknown option once, as typed on the command line, with the
 * nearest option of the command when one is close (a typo: at most two letters changed, added, removed
 * or swapped, by the optimal string alignment distance, e.g. Navarro 2001, ACM Computing Surveys 33).
 */

/** The sentence, or null when `msg` is not yargs' unknown-argument message. */
export function unknownOptionSentence(msg: string | null | undefined, knownOptions: readonly string[], argv: readonly string[] = []): string | null {
  const m = /^Unknown arguments?: (.+)$/.exec(msg ?? '');
  if (!m) return null;
  const given = m[1].split(', ').map((x) => x.trim()).filter((x) => x.length > 0);
  // yargs adds the camel-case spelling of a dashed option: keep the spelling with dashes.
  const dashed = new Set(given.filter((x) => x.includes('-')).map(camelCase));
  const names = given.filter((x) => !(dashed.has(x) && !x.includes('-')));
  const known = knownOptions.filter((k) => k.length > 1 && !/[A-Z]/.test(k));
  const parts = names.map((name) => {
    // yargs reads --no-x as x = false and names it x.
    const negated = argv.some((a) => a === `--no-${name}` || a.startsWith(`--no-${name}=`)) && !argv.some((a) => a === `--${name}` || a.startsWith(`--${name}=`));
    const shown = name.length === 1 ? `-${name}` : negated ? `--no-${name}` : `--${name}`;
    const near = nearest(name, known);
    return near ? `${shown} (did you mean --${near}?)` : shown;
  });
  return `unknown option${parts.length > 1 ? 's' : ''} ${parts.join(', ')}`;
}

function camelCase(s: string): string {
  return s.replace(/-+([a-z0-9])/g, (_, c: string) => c.toUpperCase());
}

/** The known option nearest to `name`, when it is at most two edits away and nearer than any other. */
function nearest(name: string, known: readonly string[]): string | null {
  let best: string | null = null, bestD = 3, tie = false;
  for (const k of known) {
    const d = editDistance(name, k);
    if (d < bestD) { best = k; bestD = d; tie = false; } else if (d === bestD) tie = true;
  }
  return best !== null && !tie ? best : null;
}

/** Optimal string alignment distance (insertions, deletions, substitutions, adjacent swaps). */
export function editDistance(a: string, b: string): number {
  const d: number[][] = Array.from({ length: a.length + 1 }, (_, i) => Array.from({ length: b.length + 1 }, (_, j) => (i === 0 ? j : j === 0 ? i : 0)));
  for (let i = 1; i <= a.length; i++) {
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
    }
  }
  return d[a.length][b.length];
}
