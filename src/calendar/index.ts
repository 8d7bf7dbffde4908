// Public surface of src/calendar: named exports only, no `export *`.
