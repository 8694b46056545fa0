/** GET /api/datasets/example.csv: a small invented file in the tidy format, to download as a template. */
export const exampleCsvHref = "/api/datasets/example.csv";
export const exampleCsvFileName = "tributary-example-weekly.csv";
