#!/bin/sh
# HAProxy's health check of one Galera node (external-check: $3 address, $4 port).
# Healthy only when the node is Synced and ready; a joiner, a donor or a node cut
# off from the primary component takes no clients. HAProxy clears the environment
# of a check, so the local check account (no privileges) is named here.
user=cluster_check
password=cluster-check-local
state=$(mariadb --no-defaults --connect-timeout=2 -h"$3" -P"$4" -u"$user" -p"$password" -N -B \
  -e "SHOW GLOBAL STATUS WHERE Variable_name IN ('wsrep_ready', 'wsrep_local_state')" 2>/dev/null) || exit 1
echo "$state" | grep -q '^wsrep_ready	ON$' || exit 1
echo "$state" | grep -q '^wsrep_local_state	4$' || exit 1
exit 0
