-- rollwise sql testdata/dialects/lab.roll -m 'rounded_sum,rounded2_sum,fee_ints' -b visits.id -d bigquery
WITH `visits_rows` AS (
  SELECT
    `visits`.`id` AS `visits__id`,
    (round(`visits`.`score`)) AS `rounded_sum_arg`,
    (round(`visits`.`score`, 2)) AS `rounded2_sum_arg`,
    (CAST(`visits`.`fee` AS INT64)) AS `fee_ints_arg`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits__id`,
    0 AS `grouping_id`,
    sum(`rounded_sum_arg`) AS `rounded_sum`,
    sum(`rounded2_sum_arg`) AS `rounded2_sum`,
    sum(`fee_ints_arg`) AS `fee_ints`
  FROM `visits_rows`
  GROUP BY `visits__id`
)
SELECT
  `visits__id`,
  `rounded_sum`,
  `rounded2_sum`,
  `fee_ints`,
  `grouping_id`
FROM `visits_cells`
ORDER BY `visits__id` ASC NULLS LAST;
