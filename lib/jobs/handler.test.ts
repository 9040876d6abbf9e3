import { describe, expect, it } from 'vitest';
import { describeFailure } from './handler';

describe('describeFailure', () => {
  it.each([
    { output: { message: 'job failed by timeout in active state' }, want: /stopped answering/ },
    { output: { value: { message: 'job failed by timeout in active state' } }, want: /stopped answering/ },
    { output: { message: 'replicates must satisfy 0 ≤ from ≤ to ≤ 10, got from 0, to 12\n    at runReplicates (/work/main/lib/sim/run.ts:51:11)' }, want: /^replicates must satisfy 0 ≤ from ≤ to ≤ 10, got from 0, to 12$/ },
    { output: { message: 'Cannot read x (/work/main/lib/sim/run.ts:51:11) in 1/2 of the cases' }, want: /^Cannot read x in 1\/2 of the cases$/ },
    { output: null, want: /^unknown error$/ },
    { output: { message: '' }, want: /^unknown error$/ },
  ])('$output → $want', ({ output, want }) => {
    expect(describeFailure(output)).toMatch(want);
  });
});
