/**
 * The plant this installation serves, shown under the wordmark. The demo plant is invented; a
 * real installation would read its name from the server rather than from the build.
 */
export const PLANT_NAME = 'Larkspur Valley Engine Works';
