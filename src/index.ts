/** The library API of eyeproof. A test pins this list of exports. */
export { validateSetup, mergeSetupJson, virtualImageDistanceM } from './config/validate.js';
export { setupJsonSchema } from './config/schema.js';
export { displayPresets, viewerPresets, type Preset } from './config/presets.js';
export type { Setup, Display, ScreenDisplay, HeadsetDisplay, Viewer, Light, GazePx, AcuityModelName } from './config/setup.js';
export { ConfigError, InputError, OutputError, type ConfigProblem } from './errors.js';
export { decodeFrame, type FrameInfo } from './io/decode-frame.js';
export { computeNumbers, lookAt, prepareProof, runProof, sizeSpec, type DerivedNumbers, type ProofResult, type AcuityRow, type SizeSpec } from './pipeline.js';
export { detectLabelsInFrame, proofFrame, PROOF_OUTPUT_NAMES, type ProofOutputs, type ProofInputs } from './proof.js';
export { detectTextRuns, type DetectedRun } from './analysis/detect-text.js';
export { resolveGazeSpec } from './geometry/gaze-spec.js';
export type { Label, LabelRole, LabelVerdict } from './analysis/labels.js';
export { numbersReport } from './report/build-report.js';
export { CAUTIONS } from './report/cautions.js';
export type { LinearRgb, Plane } from './image/plane.js';
