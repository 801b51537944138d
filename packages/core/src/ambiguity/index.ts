/** Integer ambiguities: LAMBDA decorrelation and search, ratio test, partial fixing. */
export { lambdaSearch, ltdl, decorrelate, searchIntegers, type IntegerSolution } from './lambda.js';
export { fixPartially, type PartialFix, type PartialFixFailure, type PartialFixOptions } from './partial-fix.js';
