import { TestClient } from './test/support/../lsp/client';
(async () => {
  const client = await TestClient.start({ capabilities: { textDocument: { publishDiagnostics: { relatedInformation: true } } } });
  for (const name of ['kiln.ts', 'portfolio.js', 'ik.ts']) {
    const file = '/tmp/prac/' + name;
    const published = client.nextDiagnostics('file://' + file);
    const { uri, text } = client.open(file);
    const diags = (await published).diagnostics;
    console.log('==', name);
    for (const d of diags) console.log(`  [${d.severity}] L${d.range.start.line + 1} ${d.code}: ${d.message.slice(0, 220)}`);
    const at = (word: string) => { const i = text.indexOf(word); const lines = text.slice(0, i).split('\n'); return { line: lines.length - 1, character: lines[lines.length - 1].length + 1 }; };
    const word = name === 'kiln.ts' ? 'function misfit(' : name === 'portfolio.js' ? 'function risk(' : 'distanceSq(q';
    const pos = at(word.replace('function ', '').replace('(q', ''));
    const hover = await client.request('textDocument/hover', { textDocument: { uri }, position: { line: at(word).line, character: at(word).character + (word.startsWith('function') ? 9 : 0) } });
    console.log('  hover:', hover ? JSON.stringify(hover.contents.value).slice(0, 900) : null);
    const lenses = await client.request('textDocument/codeLens', { textDocument: { uri } });
    console.log('  lenses:', lenses.map((l: any) => l.command?.title).join(' | '));
    void pos;
  }
  await client.stop();
})();
