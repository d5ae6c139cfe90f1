/**
 * Shared vocabulary of voxel grids used by several steps (agreement, consensus, report): the
 * axis-aligned {@link org.accordia.grid.Box} of grid indices. Public API. Depends on nothing else
 * of the project.
 */
package org.accordia.grid;
