// What a user does in the workbench, as playwright actions, and what a user sees,
// as locators. Every wait has a timeout and fails with what was expected on screen.
import type { Frame, Locator, Page } from 'playwright-core';
import { screenshot } from './browser';

/** Monaco renders spaces as U+00A0; compare text with ordinary spaces. */
export function normalizeSpaces(text: string): string {
  return text.replace(/[\u00a0\s]+/g, ' ').trim();
}

export class Workbench {
  constructor(readonly page: Page) {}

  /** Loads the workbench and waits until the explorer shows the workspace (keys pressed earlier are lost). */
  async open(url: string, explorerEntry: string): Promise<void> {
    await this.page.goto(url);
    await this.expectVisible(this.page.locator('.monaco-workbench'), 'the VS Code workbench', 60_000);
    await this.expectVisible(this.page.locator('.explorer-folders-view .monaco-list-row', { hasText: explorerEntry }).first(), `the explorer row "${explorerEntry}"`, 60_000);
  }

  /** Quick Open (Ctrl+P) with the file name, then Enter; waits for its editor tab. */
  async openFile(fileName: string): Promise<void> {
    await this.page.keyboard.press('Control+P');
    const input = this.page.locator('.quick-input-widget input.input');
    await this.expectVisible(input, 'the Quick Open input after Ctrl+P');
    await input.fill(fileName);
    // The focused row, not any row: the list of recent files is still showing for a moment.
    await this.expectVisible(this.page.locator('.quick-input-widget .monaco-list-row.focused', { hasText: fileName }), `"${fileName}" as the first Quick Open result`);
    await this.page.keyboard.press('Enter');
    await this.expectVisible(this.page.locator('.tabs-container .tab.active', { hasText: fileName }), `the active editor tab "${fileName}"`);
    await this.expectVisible(this.editor.locator('.view-lines'), `the text of ${fileName}`);
  }

  /** The active text editor. */
  get editor(): Locator {
    return this.page.locator('.editor-group-container.active .monaco-editor').first();
  }

  /** Puts the cursor at a 1-based line and column through the palette's go-to-line mode. */
  async goTo(line: number, column: number): Promise<void> {
    const input = await this.openPalette();
    await input.fill(`:${line}:${column}`);
    await this.page.keyboard.press('Enter');
    await this.expectHidden(this.page.locator('.quick-input-widget'), 'the palette to close after going to a line');
    await this.expectVisible(this.page.locator('.statusbar-item', { hasText: `Ln ${line}, Col ${column}` }), `the cursor at "Ln ${line}, Col ${column}" in the status bar`);
  }

  /**
   * F1, the command's title, Enter. A webview that takes the focus back as it settles can close
   * the palette right after it opened, so opening and typing are tried up to three times.
   */
  async runCommand(title: string): Promise<void> {
    for (let attempt = 1; ; attempt++) {
      const input = await this.openPalette();
      try {
        await input.fill(`>${title}`, { timeout: 5000 });
        break;
      } catch (error) {
        if (attempt === 3) throw error;
      }
    }
    await this.expectVisible(this.page.locator('.quick-input-widget .monaco-list-row.focused', { hasText: title }), `the command "${title}" first in the palette`);
    await this.page.keyboard.press('Enter');
  }

  /** An identifier rendered in the active editor (it must be on a visible line). */
  token(name: string): Locator {
    return this.editor.locator('.view-line span span', { hasText: new RegExp(`^${name}$`) }).first();
  }

  /** Hovers the identifier and returns the hover card's text; retries, as a hover can be cancelled by a late layout. */
  async hoverText(name: string, expected: string): Promise<string> {
    const token = this.token(name);
    await this.expectVisible(token, `the identifier ${name} in the editor`);
    const card = this.page.locator('.monaco-hover-content', { hasText: expected }).first();
    for (let attempt = 1; ; attempt++) {
      await this.page.mouse.move(5, 5);
      await token.hover();
      try {
        await card.waitFor({ state: 'visible', timeout: 5_000 });
        return normalizeSpaces(await card.innerText());
      } catch (error) {
        if (attempt === 3) return this.fail(`a hover card containing "${expected}" over ${name}`, error);
      }
    }
  }

  squiggles(): Locator {
    return this.editor.locator('.squiggly-error');
  }

  codeLens(text: string): Locator {
    return this.editor.locator('.codelens-decoration', { hasText: text }).first();
  }

  /** The Problems panel, opened once with Ctrl+Shift+M. */
  async showProblems(): Promise<Locator> {
    const panel = this.page.locator('.markers-panel');
    if (!(await panel.isVisible())) await this.page.keyboard.press('Control+Shift+M');
    await this.expectVisible(panel, 'the Problems panel after Ctrl+Shift+M');
    return panel;
  }

  /** Hides the bottom panel (Problems, Output…) with Ctrl+J. */
  async hidePanel(): Promise<void> {
    const panel = this.page.locator('.part.panel.bottom');
    if (await panel.isVisible()) await this.page.keyboard.press('Control+J');
    await this.expectHidden(panel, 'the bottom panel to close after Ctrl+J');
  }

  /** Hides the primary side bar (Explorer…) with Ctrl+B. */
  async hideSideBar(): Promise<void> {
    const sideBar = this.page.locator('.part.sidebar');
    if (await sideBar.isVisible()) await this.page.keyboard.press('Control+B');
    await this.expectHidden(sideBar, 'the side bar to close after Ctrl+B');
  }

  /** Makes the editor group of the tab titled `tabTitle` fill the editor area. */
  async maximizeGroupOf(tabTitle: string): Promise<void> {
    await this.page.locator('.tab', { hasText: tabTitle }).first().click();
    await this.runCommand('View: Toggle Maximize Editor Group');
    await this.expectHidden(this.page.locator('.tabs-container .tab', { hasText: /\.ts$/ }), `only the tab "${tabTitle}" in sight after maximizing its group`);
  }

  problemRows(text: string): Locator {
    return this.page.locator('.markers-panel .monaco-list-row', { hasText: text });
  }

  /** Ctrl+. at the cursor, then the action whose title contains `title`; returns the screenshot of the open menu. */
  async applyQuickFix(title: string, screenshotName: string): Promise<string> {
    await this.page.keyboard.press('Control+.');
    const item = this.page.locator('.action-widget .monaco-list-row', { hasText: title }).first();
    await this.expectVisible(item, `the quick fix "${title}" in the Ctrl+. menu`);
    const menu = await screenshot(this.page, screenshotName);
    await item.click();
    await this.expectHidden(this.page.locator('.action-widget'), 'the quick fix menu to close after choosing an action');
    return menu;
  }

  statusItem(text: string): Locator {
    return this.page.locator('.statusbar-item', { hasText: text }).first();
  }

  notification(text: string): Locator {
    return this.page.locator('.notifications-toasts .notification-toast, .notifications-center .notification-list-item', { hasText: text }).first();
  }

  /** The webview frame whose document holds `selector` (webviews sit in nested iframes). */
  async webviewFrame(selector: string, what: string, timeout = 30_000): Promise<Frame> {
    const deadline = Date.now() + timeout;
    for (;;) {
      for (const frame of this.page.frames()) {
        if (frame.isDetached()) continue;
        if (await frame.locator(selector).count().catch(() => 0)) return frame;
      }
      if (Date.now() > deadline) return this.fail(`${what} (a webview with ${selector})`, new Error(`no frame had it within ${timeout} ms`));
      await this.page.waitForEvent('framenavigated', { timeout: 1_000 }).catch(() => undefined);
    }
  }

  async expectVisible(locator: Locator, what: string, timeout = 30_000): Promise<void> {
    try {
      await locator.waitFor({ state: 'visible', timeout });
    } catch (error) {
      await this.fail(what, error);
    }
  }

  async expectHidden(locator: Locator, what: string, timeout = 30_000): Promise<void> {
    try {
      await locator.first().waitFor({ state: 'hidden', timeout });
    } catch (error) {
      await this.fail(what, error);
    }
  }

  /** Asserts that `locator` does not appear within `timeout`: the only way to see that nothing happens. */
  async expectAbsentFor(locator: Locator, what: string, timeout: number): Promise<void> {
    const appeared = await locator
      .first()
      .waitFor({ state: 'visible', timeout })
      .then(() => true, () => false);
    if (appeared) await this.fail(`no ${what} within ${timeout} ms`, new Error(`${what} appeared`));
  }

  /** Throws with what was expected on screen and a screenshot of what was there. */
  async fail(expected: string, cause: unknown): Promise<never> {
    const file = await screenshot(this.page, `failure-${Date.now()}`).catch(() => 'none');
    const reason = cause instanceof Error ? cause.message.split('\n')[0] : String(cause);
    throw new Error(`Expected on screen: ${expected}. ${reason}. Screenshot: ${file}`);
  }

  /** F1 until the palette shows: a webview that holds the focus swallows the first key press now and then. */
  private async openPalette(): Promise<Locator> {
    const input = this.page.locator('.quick-input-widget input.input');
    for (let attempt = 1; attempt < 3; attempt++) {
      await this.page.keyboard.press('F1');
      const shown = await input.waitFor({ state: 'visible', timeout: 10_000 }).then(() => true, () => false);
      if (shown) return input;
    }
    await this.page.keyboard.press('F1');
    await this.expectVisible(input, 'the command palette after F1');
    return input;
  }
}
