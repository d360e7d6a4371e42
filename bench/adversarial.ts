// The adversarial table: cases built to provoke a false pass, a false learning-rate alarm, a rate
// called safe too soon, or a verdict lost to the time budget (test/support/adversarial.ts), with
// the verdict each must give, the verdict given and the calls it took.
import { adversarialCases } from '../test/support/adversarial';
import { callsOf } from './budget';

export interface AdversarialRow {
  name: string;
  trap: string;
  expected: string;
  got: string;
  calls: number;
  held: boolean;
}

export function runAdversarial(log: (line: string) => void): AdversarialRow[] {
  const rows = adversarialCases.map((c) => {
    const report = c.run();
    const rate = report.learningRate?.status;
    const held = report.status === c.status && (!c.rate || rate === c.rate);
    const verdict = (status: string, rateStatus: string | undefined) => (rateStatus ? `${status}, rate ${rateStatus}` : status);
    return { name: c.name, trap: c.trap, expected: verdict(c.status, c.rate), got: verdict(report.status, c.rate ? rate ?? 'none' : undefined), calls: callsOf(report), held };
  });
  log(`  adversarial: ${rows.filter((r) => r.held).length} of ${rows.length} cases gave the verdict they must`);
  return rows;
}
