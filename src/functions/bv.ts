/*
 * Worksheet wrappers, BV family (see spec.ts for the conventions).
 */
import { bind } from './adapter';

const BV_RCV = bind('BV.RCV');
const BV_RCVLOG = bind('BV.RCVLOG');
const BV_INDIVIDUALITY = bind('BV.INDIVIDUALITY');
const BV_SETPOINT = bind('BV.SETPOINT');


/**
 * Reference change value: √2 × z × √(CV² + CVI²), z = 1.96 by default (two-sided 95 %). Percent. Source: Harris and Yasaka 1983.
 * @customfunction BV.RCV
 * @param {any[][]} cv Analytical CV, %.
 * @param {any[][]} cvi Within-subject biological variation CVI, %.
 * @param {any[][]} [z] Default 1.96.
 * @returns {any[][]} RCV, %.
 */
export function bvRcv(cv: any[][], cvi: any[][], z?: any[][]): any[][] {
  return BV_RCV(cv, cvi, z);
}

/**
 * Log-normal (asymmetric) RCV: σ = √ln(1 + (√(CV² + CVI²)/100)²); up = (e^(z√2σ) − 1) × 100, down = (e^(−z√2σ) − 1) × 100. Not linear: inputs must be percent. z = 1.96 by default. Source: Fokkema et al. 2006.
 * @customfunction BV.RCVLOG
 * @param {any[][]} cv Analytical CV, %.
 * @param {any[][]} cvi Within-subject biological variation CVI, %.
 * @param {any[][]} [z] Default 1.96.
 * @param {any[][]} [direction] "up" (default) or "down".
 * @returns {any[][]} RCV, % (negative for "down").
 */
export function bvRcvLog(cv: any[][], cvi: any[][], z?: any[][], direction?: any[][]): any[][] {
  return BV_RCVLOG(cv, cvi, z, direction);
}

/**
 * Index of individuality: √(CVI² + CV²) / CVG, CV defaults to 0. Below about 0.6, population reference intervals say little about one person. Source: Harris 1974.
 * @customfunction BV.INDIVIDUALITY
 * @param {any[][]} cvi Within-subject biological variation CVI, %.
 * @param {any[][]} cvg Between-subject biological variation CVG, %; > 0.
 * @param {any[][]} [cv] Analytical CV, %, default 0.
 * @returns {any[][]} Index of individuality.
 */
export function bvIndividuality(cvi: any[][], cvg: any[][], cv?: any[][]): any[][] {
  return BV_INDIVIDUALITY(cvi, cvg, cv);
}

/**
 * Specimens needed to estimate a person's set point within ± closeness %: ⌈(z × √(CV² + CVI²) / closeness)²⌉, at least 1; z = 1.96 by default. Source: Harris 1974.
 * @customfunction BV.SETPOINT
 * @param {any[][]} cv Analytical CV, %.
 * @param {any[][]} cvi Within-subject biological variation CVI, %.
 * @param {any[][]} closeness Closeness to the set point, %; > 0.
 * @param {any[][]} [z] Default 1.96.
 * @returns {any[][]} Number of specimens.
 */
export function bvSetpoint(cv: any[][], cvi: any[][], closeness: any[][], z?: any[][]): any[][] {
  return BV_SETPOINT(cv, cvi, closeness, z);
}
