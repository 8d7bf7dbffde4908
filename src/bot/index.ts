// Public surface of src/bot: named exports only, no `export *`.
