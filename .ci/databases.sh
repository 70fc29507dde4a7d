# Throwaway PostgreSQL and MariaDB servers for the live-engine tests
# (sourced by .ci/run; usable by hand: `. .ci/databases.sh; start_databases`).
#
# start_databases installs the Debian packages postgresql and mariadb-server
# when they are missing (needs root and apt-get), starts both servers on
# loopback ports with data directories under a fresh temp directory, waits
# until they answer, and exports ROLLWISE_TEST_POSTGRES and
# ROLLWISE_TEST_MYSQL for the tests. stop_databases stops them and removes
# the directory; call it from a trap so it runs even when tests fail.
# The recipe is the one in ../shared/design/dialects.md ("Verified on this
# project's machines").

ROLLWISE_PG_PORT=${ROLLWISE_PG_PORT:-54329}
ROLLWISE_MY_PORT=${ROLLWISE_MY_PORT:-33069}
ROLLWISE_DB_DIR=""

install_databases() {
	if command -v mariadbd >/dev/null && ls /usr/lib/postgresql/*/bin/pg_ctl >/dev/null 2>&1; then
		return 0
	fi
	echo "== installing postgresql and mariadb-server (apt-get)"
	export DEBIAN_FRONTEND=noninteractive
	apt-get update -qq
	# The packages' own services are not wanted: policy-rc.d keeps them
	# from starting (and from failing where there is no init system).
	local made=""
	if [ ! -e /usr/sbin/policy-rc.d ]; then
		printf '#!/bin/sh\nexit 101\n' >/usr/sbin/policy-rc.d
		chmod +x /usr/sbin/policy-rc.d
		made=1
	fi
	local rc=0
	apt-get install -y -qq --no-install-recommends postgresql mariadb-server >/tmp/rollwise-ci-apt.log 2>&1 || rc=$?
	[ -z "$made" ] || rm -f /usr/sbin/policy-rc.d
	if [ $rc -ne 0 ]; then
		tail -20 /tmp/rollwise-ci-apt.log
		return 1
	fi
}

# free_port prints the first port from $1 on that nothing listens on.
free_port() {
	local p=$1
	while (exec 3<>"/dev/tcp/127.0.0.1/$p") 2>/dev/null; do
		p=$((p + 1))
	done
	echo "$p"
}

start_databases() {
	install_databases || return 1
	ROLLWISE_PG_PORT=$(free_port "$ROLLWISE_PG_PORT")
	ROLLWISE_MY_PORT=$(free_port "$ROLLWISE_MY_PORT")
	ROLLWISE_DB_DIR=$(mktemp -d /tmp/rollwise-db.XXXXXX)
	chmod 755 "$ROLLWISE_DB_DIR"
	local d=$ROLLWISE_DB_DIR pgbin
	pgbin=$(ls -d /usr/lib/postgresql/*/bin | sort -V | tail -1)

	echo "== starting PostgreSQL on 127.0.0.1:$ROLLWISE_PG_PORT"
	mkdir "$d/pg" && chown postgres "$d/pg"
	runuser -u postgres -- "$pgbin/initdb" -D "$d/pg/data" -U postgres --auth=trust -E UTF8 >"$d/pg-initdb.log" 2>&1 ||
		{ cat "$d/pg-initdb.log"; return 1; }
	runuser -u postgres -- "$pgbin/pg_ctl" -D "$d/pg/data" -l "$d/pg/log" -w \
		-o "-c listen_addresses=127.0.0.1 -p $ROLLWISE_PG_PORT -k $d/pg -c fsync=off" start >/dev/null ||
		{ cat "$d/pg/log"; return 1; }

	echo "== starting MariaDB on 127.0.0.1:$ROLLWISE_MY_PORT"
	mkdir "$d/my" && chown mysql "$d/my"
	# --force: mariadb-install-db aborts when /etc/hosts has no localhost line.
	runuser -u mysql -- mariadb-install-db --no-defaults --force --datadir="$d/my/data" \
		--auth-root-authentication-method=normal --skip-test-db >"$d/my-install.log" 2>&1 ||
		{ cat "$d/my-install.log"; return 1; }
	runuser -u mysql -- mariadbd --no-defaults --datadir="$d/my/data" --bind-address=127.0.0.1 \
		--port="$ROLLWISE_MY_PORT" --socket="$d/my/s.sock" --pid-file="$d/my/p.pid" \
		--innodb-flush-log-at-trx-commit=0 >"$d/my/log" 2>&1 &
	local i
	for i in $(seq 1 60); do
		mariadb-admin --no-defaults -h127.0.0.1 -P"$ROLLWISE_MY_PORT" -uroot ping >/dev/null 2>&1 && break
		sleep 0.5
	done
	mariadb-admin --no-defaults -h127.0.0.1 -P"$ROLLWISE_MY_PORT" -uroot ping >/dev/null ||
		{ cat "$d/my/log"; return 1; }

	export ROLLWISE_TEST_POSTGRES="postgres://postgres@127.0.0.1:$ROLLWISE_PG_PORT/postgres?sslmode=disable"
	export ROLLWISE_TEST_MYSQL="mysql://root@127.0.0.1:$ROLLWISE_MY_PORT/mysql"
	echo "ROLLWISE_TEST_POSTGRES=$ROLLWISE_TEST_POSTGRES"
	echo "ROLLWISE_TEST_MYSQL=$ROLLWISE_TEST_MYSQL"
}

stop_databases() {
	local d=$ROLLWISE_DB_DIR pgbin
	[ -n "$d" ] || return 0
	echo "== stopping the test databases"
	pgbin=$(ls -d /usr/lib/postgresql/*/bin 2>/dev/null | sort -V | tail -1) || true
	if [ -d "$d/pg/data" ]; then
		runuser -u postgres -- "$pgbin/pg_ctl" -D "$d/pg/data" -m fast -w stop >/dev/null 2>&1 || true
	fi
	if [ -f "$d/my/p.pid" ]; then
		mariadb-admin --no-defaults -h127.0.0.1 -P"$ROLLWISE_MY_PORT" -uroot shutdown >/dev/null 2>&1 ||
			kill "$(cat "$d/my/p.pid")" 2>/dev/null || true
		for _ in $(seq 1 40); do
			[ -f "$d/my/p.pid" ] || break
			sleep 0.25
		done
	fi
	rm -rf "$d"
	ROLLWISE_DB_DIR=""
}
