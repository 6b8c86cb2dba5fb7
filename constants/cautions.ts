// The cautions shown on every result screen and in every PDF.
export const CAUTION_LINE =
  'Stored energy in DC-link capacitors can kill. These calculations support, and never replace, measurement and a qualified person’s judgement.';

export const CAUTIONS: readonly string[] = [
  'Stored energy in DC-link capacitors can kill or cause an arc flash after the supply is removed. Treat every capacitor as charged until proven otherwise.',
  'Calculations here support, and never replace, measurement and the judgement of a qualified person.',
  'Verify absence of voltage with a rated meter, proven on a known source before and after, before touching any part.',
  'Limits shown are the values the user entered. Check them against the current edition of the applicable standard and local regulations, and defer to the certification body or licensed assessor.',
  'Bleeder resistors can fail open, balancing resistors age and electrolytic capacitance drifts: keep measurement evidence per sample and per fault condition.',
  'Dielectric absorption can bring voltage back on a capacitor after a brief short.',
];
