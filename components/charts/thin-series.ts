// The thinning lives in lib/charts/thin-series.ts (pure, shared with the services); this module only
// keeps the components' import path.
export { MAX_CHART_POINTS, thinSeries, thinnedIndices } from "@/lib/charts/thin-series";
