// Public surface of src/jobs: named exports only, no `export *`.
