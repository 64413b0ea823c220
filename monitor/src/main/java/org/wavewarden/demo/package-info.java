/**
 * The demo: the seeded generators of the two demo datasets (the household survey and the household panel) and the
 * end-to-end demo run on an embedded server ({@code DemoRun}).
 */
package org.wavewarden.demo;
