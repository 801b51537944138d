import { describe, expect, it } from 'vitest';
import type { SolutionKind } from '../session/index.js';
import { chooseEpochs, MIN_FIXED_SHARE } from './points-summary.js';

const epochs = (fixed: number, float: number, code = 0): { kind: SolutionKind }[] => [
  ...Array.from({ length: fixed }, () => ({ kind: 'fixed' as SolutionKind })),
  ...Array.from({ length: float }, () => ({ kind: 'float' as SolutionKind })),
  ...Array.from({ length: code }, () => ({ kind: 'differential' as SolutionKind })),
];

describe('chooseEpochs', () => {
  it('takes the fixed epochs alone when they are enough and at least half of the carrier epochs', () => {
    expect(MIN_FIXED_SHARE).toBe(0.5);
    const a = chooseEpochs(epochs(60, 40), 10);
    expect(a.basis).toBe('fixed');
    expect(a.chosen).toHaveLength(60);
    expect(chooseEpochs(epochs(50, 50), 10).basis).toBe('fixed');
  });

  it('takes fixed and float together when the fixed epochs are a minority of the occupation (a fix the passes did not confirm)', () => {
    const a = chooseEpochs(epochs(25, 1180), 10);
    expect(a.basis).toBe('fixed+float');
    expect(a.chosen).toHaveLength(1205);
    expect(chooseEpochs(epochs(49, 51), 10).basis).toBe('fixed+float');
  });

  it('keeps the rest of the order: too few fixed -> fixed+float, no carrier -> code', () => {
    expect(chooseEpochs(epochs(5, 20), 10).basis).toBe('fixed+float');
    expect(chooseEpochs(epochs(0, 0, 30), 10).basis).toBe('code');
  });
});
