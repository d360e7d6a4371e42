// A tiny XML reader for the tests: enough to prove the plots' SVG is well formed
// (balanced tags, quoted attributes, escaped text) and to look elements up by class.

export interface XmlElement {
  name: string;
  attributes: Record<string, string>;
  children: XmlElement[];
  text: string;
}

const tag = /<(\/?)([A-Za-z][\w:-]*)((?:\s+[\w:-]+="[^"<]*")*)\s*(\/?)>/y;
const attribute = /([\w:-]+)="([^"]*)"/g;
const entity = /&(?:amp|lt|gt|quot|#39|#\d+|#x[0-9a-f]+);/gi;

/** Parses one element (with its subtree); throws on anything malformed. */
export function parseXml(source: string): XmlElement {
  const root: XmlElement = { name: '#root', attributes: {}, children: [], text: '' };
  const stack = [root];
  let at = 0;
  while (at < source.length) {
    const next = source.indexOf('<', at);
    const text = source.slice(at, next < 0 ? source.length : next);
    if (text.replace(entity, '').includes('&')) throw new Error(`unescaped & in text near ${JSON.stringify(text.slice(0, 40))}`);
    if (text.includes('>')) throw new Error(`stray > in text near ${JSON.stringify(text.slice(0, 40))}`);
    stack[stack.length - 1].text += text;
    if (next < 0) break;
    tag.lastIndex = next;
    const match = tag.exec(source);
    if (!match) throw new Error(`malformed tag at ${next}: ${JSON.stringify(source.slice(next, next + 60))}`);
    const [whole, closing, name, attributeText, selfClosing] = match;
    if (closing) {
      const open = stack.pop();
      if (!open || open.name !== name) throw new Error(`</${name}> closes <${open?.name}>`);
    } else {
      const element: XmlElement = { name, attributes: {}, children: [], text: '' };
      for (const [, key, value] of attributeText.matchAll(attribute)) {
        if (key in element.attributes) throw new Error(`duplicate attribute ${key} on <${name}>`);
        element.attributes[key] = value;
      }
      stack[stack.length - 1].children.push(element);
      if (!selfClosing) stack.push(element);
    }
    at = next + whole.length;
  }
  if (stack.length !== 1) throw new Error(`unclosed <${stack[stack.length - 1].name}>`);
  if (root.children.length !== 1) throw new Error(`expected one root element, found ${root.children.length}`);
  return root.children[0];
}

export function descendants(element: XmlElement): XmlElement[] {
  return element.children.flatMap((child) => [child, ...descendants(child)]);
}

export function byClass(element: XmlElement, className: string): XmlElement[] {
  return descendants(element).filter((e) => (e.attributes.class ?? '').split(/\s+/).includes(className));
}

export function byName(element: XmlElement, name: string): XmlElement[] {
  return descendants(element).filter((e) => e.name === name);
}

/** All text inside the element, entities left as written. */
export function textOf(element: XmlElement): string {
  return element.text + element.children.map(textOf).join('');
}

/** Tick positions of one axis: data value → pixel coordinate of its grid line. */
export function ticks(svg: XmlElement, axis: 'x' | 'y'): Array<{ value: number; at: number }> {
  return byClass(svg, `${axis}-tick`).map((g) => {
    const line = g.children.find((c) => c.name === 'line')!;
    return { value: Number(g.attributes['data-value']), at: Number(line.attributes[axis === 'x' ? 'x1' : 'y1']) };
  });
}

/** Where a value should be drawn, interpolated from two ticks (in log10 when `log`). */
export function expectedPosition(svg: XmlElement, axis: 'x' | 'y', value: number, log: boolean): number {
  const [a, b] = ticks(svg, axis);
  const t = log ? (Math.log10(value) - Math.log10(a.value)) / (Math.log10(b.value) - Math.log10(a.value)) : (value - a.value) / (b.value - a.value);
  return a.at + t * (b.at - a.at);
}
