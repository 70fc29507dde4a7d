-- rollwise sql testdata/dialects/lab.roll -m 'top_longest,low_shortest' -b visits.id -d bigquery
WITH `visits_rows` AS (
  SELECT
    `visits`.`id` AS `visits__id`,
    (GREATEST(COALESCE(`visits`.`score`, CAST(`visits`.`minutes` AS FLOAT64)), COALESCE(CAST(`visits`.`minutes` AS FLOAT64), `visits`.`score`))) AS `top_longest_arg`,
    (LEAST(COALESCE(`visits`.`score`, CAST(`visits`.`minutes` AS FLOAT64)), COALESCE(CAST(`visits`.`minutes` AS FLOAT64), `visits`.`score`))) AS `low_shortest_arg`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits__id`,
    0 AS `grouping_id`,
    max(`top_longest_arg`) AS `top_longest`,
    min(`low_shortest_arg`) AS `low_shortest`
  FROM `visits_rows`
  GROUP BY `visits__id`
)
SELECT
  `visits__id`,
  `top_longest`,
  `low_shortest`,
  `grouping_id`
FROM `visits_cells`
ORDER BY `visits__id` ASC NULLS LAST;
