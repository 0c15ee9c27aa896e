// A small strict XML well-formedness checker for the chart SVGs (XML 1.0 §2.1 rules that matter here):
// one root element, every tag closed in order, attributes quoted and unique, '&' only in entity or
// character references, no '<' inside attribute values or text. Returns the parsed element tree.

export interface XmlElement {
  name: string;
  attrs: Record<string, string>;
  children: XmlElement[];
  text: string;
}

const NAME = /^[A-Za-z_:][A-Za-z0-9_.:-]*/;
const ENTITY = /^&(amp|lt|gt|quot|apos|#[0-9]+|#x[0-9a-fA-F]+);/;

function decode(raw: string, where: string): string {
  let out = '';
  for (let i = 0; i < raw.length; i++) {
    const c = raw[i];
    if (c === '<') throw new Error(`'<' not allowed in ${where}`);
    if (c === '&') {
      const m = ENTITY.exec(raw.slice(i));
      if (!m) throw new Error(`Bare '&' in ${where}: ${raw.slice(i, i + 12)}`);
      const e = m[1];
      out += e === 'amp' ? '&' : e === 'lt' ? '<' : e === 'gt' ? '>' : e === 'quot' ? '"' : e === 'apos' ? "'" : String.fromCodePoint(e.startsWith('#x') ? parseInt(e.slice(2), 16) : parseInt(e.slice(1), 10));
      i += m[0].length - 1;
    } else out += c;
  }
  return out;
}

export function parseXml(src: string): XmlElement {
  let i = 0;
  if (src.startsWith('<?xml')) {
    const end = src.indexOf('?>');
    if (end < 0) throw new Error('Unclosed XML declaration');
    i = end + 2;
  }
  const stack: XmlElement[] = [];
  let root: XmlElement | null = null;
  while (i < src.length) {
    const lt = src.indexOf('<', i);
    const text = src.slice(i, lt < 0 ? src.length : lt);
    if (text.length) {
      if (!stack.length) {
        if (text.trim()) throw new Error(`Text outside the root element: ${text.slice(0, 20)}`);
      } else stack[stack.length - 1].text += decode(text, 'text');
    }
    if (lt < 0) break;
    i = lt;
    if (src.startsWith('<![CDATA[', i)) {
      const end = src.indexOf(']]>', i);
      if (end < 0) throw new Error('Unclosed CDATA');
      if (!stack.length) throw new Error('CDATA outside the root');
      stack[stack.length - 1].text += src.slice(i + 9, end);
      i = end + 3;
      continue;
    }
    if (src.startsWith('<!--', i)) {
      const end = src.indexOf('-->', i);
      if (end < 0) throw new Error('Unclosed comment');
      i = end + 3;
      continue;
    }
    if (src[i + 1] === '/') {
      const m = NAME.exec(src.slice(i + 2));
      if (!m) throw new Error(`Bad closing tag at ${i}`);
      const after = i + 2 + m[0].length;
      const gt = src.indexOf('>', after);
      if (gt < 0 || src.slice(after, gt).trim()) throw new Error(`Bad closing tag </${m[0]}`);
      const open = stack.pop();
      if (!open || open.name !== m[0]) throw new Error(`</${m[0]}> closes <${open?.name ?? 'nothing'}>`);
      i = gt + 1;
      continue;
    }
    const m = NAME.exec(src.slice(i + 1));
    if (!m) throw new Error(`Bad tag at ${i}: ${src.slice(i, i + 20)}`);
    const el: XmlElement = { name: m[0], attrs: {}, children: [], text: '' };
    i += 1 + m[0].length;
    let selfClosing = false;
    for (;;) {
      const ws = /^\s*/.exec(src.slice(i))![0];
      i += ws.length;
      if (src.startsWith('/>', i)) {
        selfClosing = true;
        i += 2;
        break;
      }
      if (src[i] === '>') {
        i += 1;
        break;
      }
      if (!ws.length) throw new Error(`Attributes of <${el.name}> need white space between them`);
      const an = NAME.exec(src.slice(i));
      if (!an) throw new Error(`Bad attribute in <${el.name}> at ${src.slice(i, i + 20)}`);
      i += an[0].length;
      if (src[i] !== '=') throw new Error(`Attribute ${an[0]} without a value`);
      const q = src[i + 1];
      if (q !== '"' && q !== "'") throw new Error(`Attribute ${an[0]} is not quoted`);
      const end = src.indexOf(q, i + 2);
      if (end < 0) throw new Error(`Unclosed attribute ${an[0]}`);
      if (an[0] in el.attrs) throw new Error(`Duplicate attribute ${an[0]} in <${el.name}>`);
      el.attrs[an[0]] = decode(src.slice(i + 2, end), `attribute ${an[0]}`);
      i = end + 1;
    }
    if (stack.length) stack[stack.length - 1].children.push(el);
    else if (root) throw new Error('More than one root element');
    else root = el;
    if (!selfClosing) stack.push(el);
  }
  if (stack.length) throw new Error(`Unclosed <${stack[stack.length - 1].name}>`);
  if (!root) throw new Error('No root element');
  return root;
}

/** Every element of the tree, depth first. */
export function allElements(el: XmlElement): XmlElement[] {
  return [el, ...el.children.flatMap(allElements)];
}
