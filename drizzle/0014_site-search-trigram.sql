-- The site search matches any part of an address or a customer's name (ILIKE '%…%'), which a
-- b-tree cannot serve. pg_trgm's GIN operator class can; it is a trusted extension on
-- PostgreSQL 13 and later, and PGlite loads it from its contrib build (src/lib/server/db/pglite.ts).
CREATE EXTENSION IF NOT EXISTS pg_trgm;
