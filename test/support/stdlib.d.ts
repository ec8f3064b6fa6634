declare module '@stdlib/stats-base-dists-normal-quantile' {
  export default function quantile(p: number, mu: number, sigma: number): number;
}
declare module '@stdlib/stats-base-dists-normal-cdf' {
  export default function cdf(x: number, mu: number, sigma: number): number;
}
declare module '@stdlib/stats-base-dists-t-quantile' {
  export default function quantile(p: number, v: number): number;
}
