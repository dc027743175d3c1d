/**
 * Response header telling whether a PDF came from the rendering cache
 * ("cached") or was drawn for this request ("rendered"). Its own module so that
 * scripts naming it do not load the report stack behind the permalinks.
 */
export const RENDERING_HEADER = "X-Trialwright-Rendering";
