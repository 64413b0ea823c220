/**
 * The self-contained HTML digest: inline CSS and SVG, no script or fetch. Each alert's chart and trend are drawn
 * from the estimates its finding was judged on, every plotted number written on its SVG element as data attributes.
 */
package org.wavewarden.deliver.html;
