#!/bin/bash
# ohmbook on a Slurm cluster: 4 array tasks analyse one shard each; a dependent job merges.
# Submit with:  sbatch deploy/slurm-array.sh
# The portfolio and work folders are on a shared file system; the checkout has run `npm ci`.
#SBATCH --job-name=ohmbook-shard
#SBATCH --array=1-4
#SBATCH --cpus-per-task=2
#SBATCH --mem=4G
#SBATCH --time=02:00:00
set -euo pipefail
PORTFOLIO=${PORTFOLIO:-$HOME/portfolio}
WORK=${WORK:-$HOME/ohmbook-work}
mkdir -p "$WORK"
# --shard auto reads SLURM_ARRAY_TASK_ID, SLURM_ARRAY_TASK_MIN and SLURM_ARRAY_TASK_COUNT.
npx ohmbook build "$PORTFOLIO" --shard auto --partial "$WORK/partial-$SLURM_ARRAY_TASK_ID" --quiet
# The last task to start queues the merge once every task has finished.
if [ "$SLURM_ARRAY_TASK_ID" = "$SLURM_ARRAY_TASK_MAX" ]; then
  sbatch --dependency=afterok:"$SLURM_ARRAY_JOB_ID" --job-name=ohmbook-merge --wrap \
    "npx ohmbook merge $WORK/partial-1 $WORK/partial-2 $WORK/partial-3 $WORK/partial-4 --out $WORK/site"
fi
