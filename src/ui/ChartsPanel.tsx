/** The four linked charts (filled in once src/charts lands). */
export function ChartsPanel() {
  return null;
}
