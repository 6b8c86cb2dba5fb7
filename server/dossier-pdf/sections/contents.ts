import type { Content } from 'pdfmake/interfaces';
import { COLOURS } from '../layout';

/** The table of contents: pdfmake fills in the page of every heading marked as a contents item. */
export function contents(): Content[] {
  return [
    {
      toc: {
        title: { text: 'Contents', style: 'h1' },
        numberStyle: { bold: true },
        textStyle: { fontSize: 9.5 },
        textMargin: [0, 3, 0, 0],
      },
      pageBreak: 'before',
    } as Content,
    { text: 'Page numbers refer to the page counter at the foot of every page.', color: COLOURS.muted, fontSize: 7.5, margin: [0, 10, 0, 0] },
  ];
}
