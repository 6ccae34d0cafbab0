export { lastIndexAtOrBefore } from "./sorted-search";
export { median, mean, medianAbsoluteDeviation, extent } from "./stats";
export { naturalSplineSecondDerivatives, evaluateSplineInterval } from "./natural-cubic-spline";
