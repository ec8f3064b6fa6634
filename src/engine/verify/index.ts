/** Verification with confidence: CV limits, limits of agreement, sigma limits, precision and trueness claims. */
export { VERIFY_ALPHA } from './common';
export { cvLimits, DEFAULT_CV_CONFIDENCE } from './cvLimits';
export type { CvLimits } from './cvLimits';
export { agreement, AGREEMENT_Z, DEFAULT_AGREEMENT_CONFIDENCE, DEFAULT_AGREEMENT_SCALE, readAgreementScale } from './agreement';
export type { Agreement, AgreementScale } from './agreement';
export { sigmaLimits, DEFAULT_SIGMA_CONFIDENCE } from './sigmaLimits';
export type { SigmaLimits } from './sigmaLimits';
export { verifyPrecision, verificationLimit } from './precision';
export type { PrecisionVerification, Verdict } from './precision';
export { verifyTrueness } from './trueness';
export type { TruenessVerification } from './trueness';
