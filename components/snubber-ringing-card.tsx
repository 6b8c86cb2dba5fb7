import { useMemo } from 'react';
import { Text } from 'react-native';
import { type } from '../constants/theme';
import { ringingCurves, type RingingSizing } from '../shared/engine/snubber';
import { formatPercent, formatQuantity } from '../shared/units';
import { RingingChart } from './ringing-chart';
import { snubberParts } from './snubber-sizing-results';
import { Card } from './ui/card';

interface Props {
  sizing: RingingSizing;
  /** The switching voltage, or null to draw the curves per volt of step. */
  voltage: number | null;
}

export function SnubberRingingCard({ sizing, voltage }: Props) {
  const curves = useMemo(
    () =>
      ringingCurves({
        lPar: sizing.lPar,
        cPar: sizing.cPar,
        resistance: sizing.resistanceE24,
        capacitance: sizing.capacitanceE12,
        voltage: voltage ?? 1,
        periods: 6,
        points: 300,
      }),
    [sizing, voltage],
  );
  const parts = snubberParts(sizing);
  const after = curves.afterRinging;
  const summary =
    `Without the snubber the node overshoots by ${formatPercent(curves.beforeRinging.overshoot, 2)} and keeps ringing at ${formatQuantity(sizing.f0, 'Hz')}. ` +
    `With ${parts} it overshoots by ${formatPercent(after.overshoot, 2)}` +
    (after.decayTimeConstant === null ? '.' : ` and the ringing dies away with a time constant of ${formatQuantity(after.decayTimeConstant, 's')}.`);
  return (
    <Card title="Ringing before and after" testID="sizing-ringing">
      <RingingChart
        testID="ringing-chart"
        before={curves.before}
        after={curves.after}
        beforeLabel="Without snubber (dashed): lossless loop, rings on"
        afterLabel={`With the ${parts} snubber (solid)`}
        unit={voltage === null ? '' : 'V'}
        yTitle={voltage === null ? 'Node voltage per volt of step' : `Node voltage for a ${formatQuantity(voltage, 'V')} step (V)`}
        settled={voltage ?? 1}
        summary={summary}
      />
      <Text style={type.small} testID="ringing-summary">
        {summary}
      </Text>
    </Card>
  );
}
