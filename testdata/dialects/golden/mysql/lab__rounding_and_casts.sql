-- rollwise sql testdata/dialects/lab.roll -m 'rounded_sum,rounded2_sum,fee_ints' -b visits.id -d mysql
WITH `visits_rows` AS (
  SELECT
    `visits`.`id` AS `visits.id`,
    (CASE WHEN ABS(`visits`.`score`) < 1e30 THEN CAST(ROUND(CAST(`visits`.`score` AS DECIMAL(65, 30))) AS DOUBLE) ELSE ROUND(`visits`.`score`) END) AS `rounded_sum_arg`,
    (CASE WHEN ABS(`visits`.`score`) < 1e30 THEN CAST(ROUND(CAST(`visits`.`score` AS DECIMAL(65, 30)), 2) AS DOUBLE) ELSE ROUND(`visits`.`score`, 2) END) AS `rounded2_sum_arg`,
    (CAST(`visits`.`fee` AS SIGNED)) AS `fee_ints_arg`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits.id`,
    0 AS `grouping_id`,
    sum(`rounded_sum_arg`) AS `rounded_sum`,
    sum(`rounded2_sum_arg`) AS `rounded2_sum`,
    sum(`fee_ints_arg`) AS `fee_ints`
  FROM `visits_rows`
  GROUP BY `visits.id`
)
SELECT
  `visits.id`,
  `rounded_sum`,
  `rounded2_sum`,
  `fee_ints`,
  `grouping_id`
FROM `visits_cells`
ORDER BY CASE WHEN `visits.id` IS NULL THEN 1 ELSE 0 END, `visits.id` ASC;
