/** Exit codes of the eyeproof command, documented in the README. */
export const EXIT = {
  ok: 0,
  internal: 1,
  usage: 2,
  setup: 3,
  input: 4,
  output: 5,
} as const;
