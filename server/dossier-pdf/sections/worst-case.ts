import type { Content, TableCell } from 'pdfmake/interfaces';
import type { NetworkState } from '../../../shared/schema/discharge';
import { plain, quantity } from '../format';
import { caption, grid, heading, keepWithHeadings, subheading } from '../layout';
import type { DossierPdfModel } from '../model';

const NETWORK_ROWS: Array<{ key: keyof NetworkState; label: string; unit: string }> = [
  { key: 'resistance', label: 'Network resistance (total)', unit: 'Ω' },
  { key: 'capacitance', label: 'Network capacitance (total)', unit: 'F' },
  { key: 'initialVoltage', label: 'Initial voltage', unit: 'V' },
  { key: 'tau', label: 'Time constant τ of the passive network', unit: 's' },
  { key: 'safeThreshold', label: 'Voltage at which the earliest criterion is met', unit: 'V' },
  { key: 'timeToSafe', label: 'Time to safe (declared discharge path)', unit: 's' },
  { key: 'passiveTimeToSafe', label: 'Time to safe (passive bleeders alone)', unit: 's' },
];

export function worstCaseSection(model: DossierPdfModel): Content[] {
  const { nominal, worstCase, sensitivity } = model.revision.results;
  const content: Content[] = [heading('3  Worst case and sensitivity')];
  if (!nominal || !worstCase) {
    content.push({ text: 'Not computed: the design inputs are incomplete.', italics: true });
  } else {
    content.push(
      caption(
        'Worst case is the slowest discharge: highest resistance and capacitance within tolerance, temperature and drift, from the maximum bus voltage.',
      ),
      grid(
        ['Quantity', 'Nominal', 'Worst case'],
        NETWORK_ROWS.map((r): TableCell[] => [r.label, quantity(nominal[r.key], r.unit), { text: quantity(worstCase[r.key], r.unit), bold: true }]),
        ['*', 110, 110],
      ),
    );
  }
  content.push(subheading('Sensitivity'));
  if (!sensitivity || !sensitivity.entries.length) {
    content.push({ text: 'Not computed.', italics: true });
  } else {
    const entries = [...sensitivity.entries].sort((p, q) => Math.abs(q.percentPerPercent) - Math.abs(p.percentPerPercent));
    content.push(
      caption(`Change of ${sensitivity.of} in percent for a +1 % change of each input; the largest first.`),
      grid(
        ['Input', '% per +1 %'],
        entries.map((e): TableCell[] => [
          e.label,
          { text: `${e.percentPerPercent >= 0 ? '+' : '−'}${plain(Math.abs(e.percentPerPercent), 3)} %`, alignment: 'right' },
        ]),
        ['*', 90],
      ),
    );
  }
  return keepWithHeadings(content);
}
