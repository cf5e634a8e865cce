/** The cautions every report, caption and the README carry. */
export const CAUTION_SHORT = 'Average-eye model from published population data — not a medical device or diagnosis.';

export const CAUTIONS: readonly string[] = [
  'These results model an average eye from published population data; individual eyes differ.',
  'eyeproof is not a medical device and makes no diagnosis; it does not replace an eye examination or a user study.',
  'For safety-critical displays (vehicles, aviation, medical devices, industrial control) the applicable standards and licensed practice govern; use these results only as a design aid beside them.',
];
