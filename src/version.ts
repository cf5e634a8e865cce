/** eyeproof's version (package.json's; a test keeps the two equal). Part of batch job ids and page footers. */
export const EYEPROOF_VERSION = '0.1.0';
