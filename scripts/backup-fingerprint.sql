-- What a restore must reproduce exactly: row counts of every table, and checksums of
-- every verified curve's points and of every raw file (with each file's stored SHA-256
-- checked against its bytes). One line each, "name|value", sorted, so two runs compare with diff.
SELECT name || '|' || value FROM (
  SELECT 'rows:' || table_schema || '.' || table_name AS name,
         (xpath('/row/n/text()', query_to_xml(format('SELECT count(*) AS n FROM %I.%I', table_schema, table_name), false, true, '')))[1]::text AS value
  FROM information_schema.tables
  WHERE table_type = 'BASE TABLE' AND table_schema NOT IN ('pg_catalog', 'information_schema')
  UNION ALL
  SELECT 'verified-points', coalesce(md5(string_agg(id || ':' || md5(wavelength_nm::text || '|' || transmission::text), ',' ORDER BY id)), '-')
  FROM curves WHERE status = 'verified'
  UNION ALL
  SELECT 'raw-files', coalesce(md5(string_agg(id || ':' || sha256 || ':' || size_bytes, ',' ORDER BY id)), '-')
  FROM submission_files
  UNION ALL
  SELECT 'raw-files-not-matching-their-sha256', count(*)::text
  FROM submission_files WHERE encode(sha256(content), 'hex') <> sha256
) f
ORDER BY 1;
