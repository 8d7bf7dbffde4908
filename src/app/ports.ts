// Ports: the calls the use cases make on outer adapters, and nothing more. Each section belongs to the
// part of the code that implements it; edit only your own section.

// --- store (bookings, holds, deliveries, audit) ---

// --- calendar feeds ---

// --- chat ---
