// Where the server's settings come from: pulled with workspace/configuration when the
// client supports it, pushed in didChangeConfiguration otherwise, defaults when neither.
import type { Connection } from 'vscode-languageserver';
import { defaultSettings, readSettings, type SlopecheckSettings } from '../shared/settings';

/** A client that says it answers workspace/configuration but never does must not stall checks. */
const pullTimeoutMs = 3000;

export class SettingsSource {
  current: SlopecheckSettings = defaultSettings;

  constructor(private readonly connection: Connection, private readonly canPull: boolean) {}

  async pull(): Promise<SlopecheckSettings> {
    if (!this.canPull) return this.current;
    let timer: NodeJS.Timeout | undefined;
    const timeout = new Promise<undefined>((resolve) => {
      timer = setTimeout(() => resolve(undefined), pullTimeoutMs);
    });
    try {
      const raw = await Promise.race([this.connection.workspace.getConfiguration('slopecheck'), timeout]);
      if (raw !== undefined) this.current = readSettings(raw);
    } catch (error) {
      this.connection.console.warn(`could not read the slopecheck settings, keeping the current ones: ${String(error)}`);
    } finally {
      clearTimeout(timer);
    }
    return this.current;
  }

  /** didChangeConfiguration: pull again, or read the pushed `slopecheck` section. */
  async changed(pushed: unknown): Promise<SlopecheckSettings> {
    if (this.canPull) return this.pull();
    const section = (pushed as { slopecheck?: unknown } | null)?.slopecheck;
    if (section !== undefined) this.current = readSettings(section);
    return this.current;
  }
}
