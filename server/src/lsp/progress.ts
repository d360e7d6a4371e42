// Work-done progress of one document check: begin, one report per pair, end.
// Creating the progress token is a round trip to the client, so reports that
// come before it is ready are folded into the latest state instead of waiting.

/** The part of vscode-languageserver's WorkDoneProgressServerReporter we use. */
export interface ProgressReporter {
  begin(title: string, percentage?: number, message?: string, cancellable?: boolean): void;
  report(percentage: number, message: string): void;
  done(): void;
}

export type ProgressFactory = () => Promise<ProgressReporter>;

export class CheckProgress {
  private reporter: ProgressReporter | null = null;
  private ended = false;
  private latest: { percentage: number; message: string } = { percentage: 0, message: '' };

  constructor(create: ProgressFactory, private readonly title: string) {
    create().then(
      (reporter) => {
        // A check that ended first still closes its token: the library forgets a reporter
        // only in done(), so skipping it would keep one per fast check for the server's life.
        if (this.ended) return reporter.done();
        this.reporter = reporter;
        reporter.begin(this.title, this.latest.percentage, this.latest.message, false);
      },
      () => undefined,
    );
  }

  pairChecked(done: number, total: number, objective: string): void {
    this.latest = { percentage: Math.round((100 * done) / Math.max(total, 1)), message: `${done}/${total} pairs · ${objective}` };
    this.reporter?.report(this.latest.percentage, this.latest.message);
  }

  end(): void {
    if (this.ended) return;
    this.ended = true;
    this.reporter?.done();
  }
}
