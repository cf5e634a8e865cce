/** Reading a labels file: the text runs of a frame with their boxes and letter sizes. */
import { LABEL_ROLES, type Label } from '../analysis/labels.js';
import { InputError } from '../errors.js';
import { describeJsonProblems, parseJson } from './parse-json.js';

const FIX = 'A labels file is {"labels": [{"id", "text", "boxPx": [x, y, width, height], "letterHeightPx", "letterSpacingPx"?, "role"?: "glance" | "look" | "decorative"}]} in frame pixels; see sample-scenes/*.labels.json.';

/** Parses and checks labels JSON against the frame size; every problem names the label and field. */
export function parseLabels(text: string, file: string, frameWidthPx: number, frameHeightPx: number): Label[] {
  const parsed = parseJson(text);
  if (parsed.problems.length) throw new InputError(file, `is not valid JSON:\n  - ${describeJsonProblems(parsed.problems).join('\n  - ')}`, FIX);
  const json = parsed.value;
  const list = (json as { labels?: unknown })?.labels;
  if (!Array.isArray(list)) throw new InputError(file, 'has no "labels" array', FIX);
  const problems: string[] = [];
  const labels: Label[] = [];
  list.forEach((raw, i) => {
    const where = `labels[${i}]${typeof raw?.id === 'string' ? ` ("${raw.id}")` : ''}`;
    const box = raw?.boxPx;
    const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
    if (typeof raw?.text !== 'string') problems.push(`${where}.text: expected a string`);
    if (!Array.isArray(box) || box.length !== 4 || !box.every(isNum)) {
      problems.push(`${where}.boxPx: expected [x, y, width, height] in px`);
    } else if (box[0] < 0 || box[1] < 0 || box[2] <= 0 || box[3] <= 0 || box[0] + box[2] > frameWidthPx || box[1] + box[3] > frameHeightPx) {
      problems.push(`${where}.boxPx: ${JSON.stringify(box)} must lie inside the ${frameWidthPx}×${frameHeightPx} frame with a positive size`);
    }
    if (!isNum(raw?.letterHeightPx) || raw.letterHeightPx <= 0) problems.push(`${where}.letterHeightPx: expected a capital-letter height above 0 px`);
    if (raw?.letterSpacingPx !== undefined && !isNum(raw.letterSpacingPx)) problems.push(`${where}.letterSpacingPx: expected a number of px`);
    if (raw?.characters !== undefined && !(Number.isInteger(raw.characters) && raw.characters >= 1 && raw.characters <= 10000)) problems.push(`${where}.characters: expected a whole number of characters from 1 to 10000`);
    if (raw?.role !== undefined && !(LABEL_ROLES as readonly unknown[]).includes(raw.role)) problems.push(`${where}.role: expected one of ${LABEL_ROLES.map((r) => `"${r}"`).join(', ')} (glance: read without moving the eyes; look: read when looked at, the default; decorative: not judged)`);
    labels.push({
      id: typeof raw?.id === 'string' ? raw.id : `label-${i + 1}`, text: raw?.text, boxPx: box, letterHeightPx: raw?.letterHeightPx, letterSpacingPx: raw?.letterSpacingPx,
      ...(raw?.role !== undefined ? { role: raw.role } : {}),
      ...(raw?.characters !== undefined ? { characters: raw.characters } : {}),
    });
  });
  if (problems.length) throw new InputError(file, `has ${problems.length} problem${problems.length === 1 ? '' : 's'}:\n  - ${problems.join('\n  - ')}`, FIX);
  return labels;
}
