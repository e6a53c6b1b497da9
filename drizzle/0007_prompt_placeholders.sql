-- Definition format 1 → 2: prompts write a given as [T1] instead of @{T1}.
-- The same rewrite as upgradeLegacyPrompt (app/domain/authoring/placeholder-syntax.ts,
-- LEGACY_REWRITES), pattern for pattern, in the same order:
--   1. a "[" the new syntax would read (a letter after it, no backslash or TeX command
--      before it, not a Markdown link "[text](") gets a backslash, so it stays a bracket;
--   2. "@@{" (a literal "@{" in format 1) becomes chr(1), which no prompt holds;
--   3. "@{name …}" right before "(" becomes "[name …] (" ("](" would read as a link);
--   4. every other "@{name …}" on one line becomes "[name …]";
--   5. chr(1) becomes "@{" again (plain text in format 2).
-- Only the prompt and the format change. Givens, constraints, physics and finds are left
-- as they are, so every variant (numbers and key) of every version stays the same; frozen
-- versions are rewritten too, because their content would otherwise no longer read as
-- intended. Rows already at format 2 are not touched, so running this twice changes nothing.
UPDATE "problem_versions"
SET "definition" = jsonb_set(
  jsonb_set(
    "definition",
    '{prompt}',
    to_jsonb(
      replace(
        regexp_replace(
          regexp_replace(
            replace(
              regexp_replace("definition"->>'prompt', '(?<!\\[A-Za-z]*)\[(?=[A-Za-z])(?![^\]\n]*\]\()', '\\[', 'g'),
              '@@{', chr(1)
            ),
            '@\{[ \t]*([A-Za-z][^}\n]{0,78}?)[ \t]*\}(?=\()', '[\1] ', 'g'
          ),
          '@\{[ \t]*([A-Za-z][^}\n]{0,78}?)[ \t]*\}', '[\1]', 'g'
        ),
        chr(1), '@{'
      )
    )
  ),
  '{format}',
  '2'::jsonb
)
WHERE "definition"->>'format' = '1' AND jsonb_typeof("definition"->'prompt') = 'string';
