// The engineer's notes as typeset text: marked (a maintained CommonMark parser) reads the markdown
// into tokens, mapped here to pdfmake nodes — headings, paragraphs, bullet and numbered lists, bold,
// italics, inline code and code blocks — so no raw markup reaches the dossier. Short blocks do not
// break across pages, and a heading travels with the block after it.
import { Lexer, type Token, type Tokens } from 'marked';
import type { Content } from 'pdfmake/interfaces';
import { COLOURS, keepWithHeadings, lead, MONO } from './layout';

/** Blocks up to about this many lines are kept whole, so no short tail is stranded on the next page. */
const SHORT_LINES = 4;
/** Characters per line of body text across the content width, for that estimate. */
const LINE_CHARS = 105;

type Run = Exclude<Content, Content[]> | string;

function inline(tokens: readonly Token[] | undefined, style: Record<string, unknown> = {}): Run[] {
  const runs: Run[] = [];
  for (const t of tokens ?? []) {
    switch (t.type) {
      case 'strong':
        runs.push(...inline((t as Tokens.Strong).tokens, { ...style, bold: true }));
        break;
      case 'em':
        runs.push(...inline((t as Tokens.Em).tokens, { ...style, italics: true }));
        break;
      case 'codespan':
        runs.push({ text: decode((t as Tokens.Codespan).text), font: MONO, fontSize: 7.8, background: COLOURS.band, ...style });
        break;
      case 'del':
        runs.push(...inline((t as Tokens.Del).tokens, { ...style, decoration: 'lineThrough' }));
        break;
      case 'link': {
        const link = t as Tokens.Link;
        runs.push(...inline(link.tokens, style), { text: ` (${link.href})`, color: COLOURS.muted, ...style });
        break;
      }
      case 'br':
        runs.push({ text: '\n', ...style });
        break;
      case 'html':
        // Tags are markup, not content: keep what they enclose.
        runs.push({ text: decode(stripTags(t.raw)), ...style });
        break;
      case 'text': {
        const text = t as Tokens.Text;
        if (text.tokens?.length) runs.push(...inline(text.tokens, style));
        else runs.push({ text: decode(text.text), ...style });
        break;
      }
      default:
        runs.push({ text: decode('text' in t ? String(t.text) : t.raw), ...style });
    }
  }
  return runs;
}

const ENTITIES: Record<string, string> = { '&amp;': '&', '&lt;': '<', '&gt;': '>', '&quot;': '"', '&#39;': "'" };
const decode = (text: string) => text.replace(/&(amp|lt|gt|quot|#39);/g, (m) => ENTITIES[m]);

const stripTags = (html: string) => html.replace(/<[^>]*>/g, '');

const shortEnough = (raw: string) => Math.ceil(raw.length / LINE_CHARS) + raw.split('\n').length - 1 <= SHORT_LINES;

function listItem(item: Tokens.ListItem): Content {
  const parts: Content[] = [];
  for (const t of item.tokens) {
    if (t.type === 'text') parts.push({ text: inline((t as Tokens.Text).tokens ?? [t]) });
    else parts.push(...block(t));
  }
  return parts.length === 1 ? parts[0] : { stack: parts };
}

function block(t: Token): Content[] {
  switch (t.type) {
    case 'heading': {
      const h = t as Tokens.Heading;
      return [lead({ text: inline(h.tokens), bold: true, fontSize: h.depth <= 2 ? 9.5 : 9, margin: [0, 6, 0, 2] })];
    }
    case 'paragraph':
      return [{ text: inline((t as Tokens.Paragraph).tokens), margin: [0, 0, 0, 4], unbreakable: shortEnough(t.raw) }];
    case 'list': {
      const list = t as Tokens.List;
      const items = list.items.map((item) => ({ stack: [listItem(item)], unbreakable: shortEnough(item.raw) }));
      return [list.ordered ? { ol: items, start: Number(list.start) || 1, margin: [0, 0, 0, 4] } : { ul: items, margin: [0, 0, 0, 4] }];
    }
    case 'code':
      return [
        {
          table: {
            widths: ['*'],
            body: [[{ text: (t as Tokens.Code).text, font: MONO, fontSize: 7.5, preserveLeadingSpaces: true, fillColor: COLOURS.band }]],
          },
          layout: 'noBorders',
          margin: [0, 0, 0, 4],
          unbreakable: shortEnough(t.raw),
        },
      ];
    case 'blockquote':
      return [{ stack: (t as Tokens.Blockquote).tokens.flatMap(block), margin: [10, 0, 0, 4], color: '#333333' }];
    case 'hr':
      return [{ canvas: [{ type: 'line', x1: 0, y1: 2, x2: 200, y2: 2, lineWidth: 0.5, lineColor: COLOURS.rule }], margin: [0, 2, 0, 6] }];
    case 'space':
      return [];
    case 'html':
      return stripTags(t.raw).trim() ? [{ text: decode(stripTags(t.raw).trim()), margin: [0, 0, 0, 4] }] : [];
    default:
      return [{ text: decode(t.raw.trim()), margin: [0, 0, 0, 4] }];
  }
}

/** Markdown text → pdfmake content, headings glued to what follows. */
export function markdownContent(markdown: string): Content[] {
  return keepWithHeadings(new Lexer().lex(markdown).flatMap(block));
}
