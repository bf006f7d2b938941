// The robust sigma every outlier method and score uses.
//
// AEC-Q001 Rev-D ("Guidelines for Part Average Testing", Automotive Electronics Council, 2011)
// defines Robust Sigma = (Q3 - Q1) / 1.35. We use the standard's 1.35 for every limit and every
// score in robust sigmas (PAT, NNR, excursion scores, mechanism misfits), so a score means the
// same in every view. The descriptive `robustSigma` of the statistics tables keeps the
// normal-consistent 1.349 (2 x 0.67449) of src/core/stats; the two differ by 0.07 %.
export const PAT_IQR_DIVISOR = 1.35;
