#!/usr/bin/env bash
# SPDX-License-Identifier: GPL-2.0-or-later
# Run the test suite (`make test`) on a newer Debian inside a debootstrap chroot:
#   bash .ci/chroot_test.sh trixie    Debian 13, QGIS 3.40 (CI runs this after the host suite)
#   bash .ci/chroot_test.sh sid       Debian unstable (before a release; not in CI)
# Run as root (debootstrap, chroot and mount need it). The chroot lives in .build/chroot-SUITE
# and is reused while its stamp (suite, mirror, package list) matches; the checkout is
# bind-mounted at the same path inside it, and the chroot's venv is .build/venv-SUITE (never the
# host's .venv; under .build so the tree-walking tests and the package skip it).
# Environment: SEAWAY_DEBIAN_MIRROR overrides the mirror read from the host's apt sources.
set -euo pipefail

suite="${1:-}"
case "$suite" in
    trixie|sid) ;;
    *) echo "usage: $0 trixie|sid [make arguments, default: test]" >&2; exit 2 ;;
esac
here="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$here"
log() { echo "chroot-test[$suite]: $*"; }
if [ "$(id -u)" -ne 0 ]; then
    log "must run as root (debootstrap, chroot and mount need it)" >&2
    exit 1
fi

root="${SEAWAY_CHROOT_ROOT:-$here/.build/chroot-$suite}"  # override to share one chroot between checkouts
venv=".build/venv-$suite"
stamp="$root/.seaway-chroot-stamp"
base_stamp="$root/.seaway-debootstrap-stamp"
timings=()
phase_end() {  # name start_seconds
    local secs=$(( $(date +%s) - $2 ))
    timings+=("$1 ${secs}s")
    log "phase $1 took ${secs} s"
}

# ------------------------------------------------------------------ packages and mirror
# The same Debian packages as the host bootstrap (read from .ci/bootstrap.sh, one list), plus
# what a minbase chroot lacks to run `make test` (make; git for `git ls-files` in the package
# test; ca-certificates for pip).
eval "$(sed -n '/^APT_PACKAGES=(/,/)/p' .ci/bootstrap.sh)"
EXTRA_PACKAGES=(make git ca-certificates)
PACKAGES=("${APT_PACKAGES[@]}" "${EXTRA_PACKAGES[@]}")

sources_text() {
    cat /etc/apt/sources.list /etc/apt/sources.list.d/*.list /etc/apt/sources.list.d/*.sources \
        2>/dev/null | grep -vE '^\s*#' || true
}
mirror="${SEAWAY_DEBIAN_MIRROR:-}"
if [ -z "$mirror" ]; then
    mirror="$(sources_text | grep -oE 'https?://[^ ]+/debian/?( |$)' | head -n1 | tr -d ' ')"
    mirror="${mirror%/}"
    mirror="${mirror:-http://deb.debian.org/debian}"
fi
security="$(sources_text | grep -oE 'https?://[^ ]+/debian-security/?( |$)' | head -n1 | tr -d ' ')"
security="${security%/}"
key="$(printf '%s\n' "$suite" "$mirror" "$security" "${PACKAGES[@]}" | sha1sum | cut -c1-12)"
base_key="$(printf '%s\n' "$suite" "$mirror" | sha1sum | cut -c1-12)"

# ------------------------------------------------------------------ mounts and cleanup
mkdir -p "$here/.build"
exec 9>"$root.lock"
if ! flock -n 9; then
    log "another run is using $root; wait for it to finish" >&2
    exit 1
fi

mounts_under_root() { findmnt -rn -o TARGET | grep -F "$root/" | sort -r || true; }
unmount_all() {
    local m
    for m in $(mounts_under_root); do
        umount "$m" 2>/dev/null || umount -l "$m" || true
    done
}
stop_chroot_processes() {
    # Processes this run started inside the chroot that are still alive (e.g. a stray Xvfb).
    local p pid
    for p in /proc/[0-9]*; do
        pid="${p#/proc/}"
        if [ "$(readlink "$p/root" 2>/dev/null)" = "$root" ]; then
            log "stopping leftover process $pid ($(tr '\0' ' ' < "$p/cmdline" 2>/dev/null | cut -c1-80))"
            kill "$pid" 2>/dev/null || true
        fi
    done
}
cleanup() {
    stop_chroot_processes
    unmount_all
    if [ -n "$(mounts_under_root)" ]; then
        log "WARNING: still mounted under $root: $(mounts_under_root | tr '\n' ' ')" >&2
    fi
}
trap cleanup EXIT
trap 'exit 130' INT
trap 'exit 143' TERM
unmount_all  # leftovers of a run that was killed (the lock says no run is active)

bind() {  # src dst [ro]
    mkdir -p "$2"
    mount --bind "$1" "$2"
    mount --make-private "$2"
    if [ "${3:-}" = ro ]; then mount -o remount,bind,ro "$2"; fi
}
mount_system() {
    mountpoint -q "$root/proc" || mount -t proc proc "$root/proc"
    mountpoint -q "$root/sys" || mount -t sysfs -o ro sysfs "$root/sys" 2>/dev/null \
        || bind /sys "$root/sys" ro
    mountpoint -q "$root/dev" || bind /dev "$root/dev"
    mountpoint -q "$root/dev/pts" || bind /dev/pts "$root/dev/pts"
    if [ -d /dev/shm ] && ! mountpoint -q "$root/dev/shm"; then bind /dev/shm "$root/dev/shm"; fi
}

# What pip and TLS need inside (copied on every run, so they follow the host's).
copy_host_config() {
    local d
    cp -L /etc/resolv.conf "$root/etc/resolv.conf" 2>/dev/null || true
    cp /etc/hosts "$root/etc/hosts" 2>/dev/null || true
    if [ -d /usr/local/share/ca-certificates ]; then
        mkdir -p "$root/usr/local/share/ca-certificates"
        cp -a /usr/local/share/ca-certificates/. "$root/usr/local/share/ca-certificates/"
    fi
    if [ -d /etc/ssl/certs ]; then
        mkdir -p "$root/etc/ssl/certs"
        cp -a /etc/ssl/certs/. "$root/etc/ssl/certs/"
    fi
    if [ -f /etc/pip.conf ]; then cp /etc/pip.conf "$root/etc/pip.conf"; fi
    if [ -d /etc/xdg/pip ]; then
        mkdir -p "$root/etc/xdg/pip" && cp -a /etc/xdg/pip/. "$root/etc/xdg/pip/"
    fi
    for d in .config/pip .pip; do
        if [ -d "$HOME/$d" ]; then
            mkdir -p "$root/root/$d" && cp -a "$HOME/$d/." "$root/root/$d/"
        fi
    done
    return 0
}

# ------------------------------------------------------------------ build (or reuse)
if [ -f "$stamp" ] && [ "$(cat "$stamp")" = "$key" ]; then
    log "reusing $root (stamp $key)"
else
    if [ ! -f "$base_stamp" ] || [ "$(cat "$base_stamp")" != "$base_key" ]; then
        if [ -e "$root" ]; then
            if [ -n "$(mounts_under_root)" ]; then
                log "refusing to delete $root: still mounted: $(mounts_under_root | tr '\n' ' ')" >&2
                exit 1
            fi
            log "removing incomplete chroot $root"
            rm -rf --one-file-system "$root"
        fi
        start=$(date +%s)
        if ! command -v debootstrap >/dev/null 2>&1; then
            log "installing debootstrap on the host"
            export DEBIAN_FRONTEND=noninteractive
            apt-get update -qq
            apt-get install -y -q --no-install-recommends debootstrap
        fi
        script=()
        if [ ! -e "/usr/share/debootstrap/scripts/$suite" ]; then
            script=(/usr/share/debootstrap/scripts/sid)  # an older debootstrap: same script
        fi
        log "debootstrap $suite from $mirror into $root"
        debootstrap --variant=minbase --components=main "$suite" "$root" "$mirror" \
            "${script[@]}" > "$here/.build/debootstrap-$suite.log" 2>&1 || {
            tail -n 30 "$here/.build/debootstrap-$suite.log" >&2
            log "debootstrap failed (log: .build/debootstrap-$suite.log)" >&2
            exit 1
        }
        echo "$base_key" > "$base_stamp"
        phase_end debootstrap "$start"
    fi

    start=$(date +%s)
    {
        echo "deb $mirror $suite main"
        if [ "$suite" != sid ]; then
            echo "deb $mirror $suite-updates main"
            [ -n "$security" ] && echo "deb $security $suite-security main"
        fi
    } > "$root/etc/apt/sources.list"
    # No daemons started by package scripts; no docs or man pages; no fsync per file.
    printf '#!/bin/sh\nexit 101\n' > "$root/usr/sbin/policy-rc.d"
    chmod 755 "$root/usr/sbin/policy-rc.d"
    printf 'path-exclude=/usr/share/doc/*\npath-exclude=/usr/share/man/*\npath-exclude=/usr/share/info/*\n' \
        > "$root/etc/dpkg/dpkg.cfg.d/01-seaway-nodoc"
    echo force-unsafe-io > "$root/etc/dpkg/dpkg.cfg.d/02-seaway-unsafe-io"
    printf 'APT::Install-Recommends "false";\nAPT::Install-Suggests "false";\n' \
        > "$root/etc/apt/apt.conf.d/01-seaway-norecommends"
    copy_host_config
    mount_system
    apt_log="$here/.build/apt-$suite.log"
    chroot_apt() {
        chroot "$root" /usr/bin/env -i PATH=/usr/sbin:/usr/bin:/sbin:/bin \
            DEBIAN_FRONTEND=noninteractive LANG=C.UTF-8 HOME=/root apt-get "$@" >> "$apt_log" 2>&1
    }
    apt_failed() {
        tail -n 30 "$apt_log" >&2
        log "apt failed (log: .build/apt-$suite.log)" >&2
        exit 1
    }
    : > "$apt_log"
    if ! chroot_apt update -qq; then
        # A frozen mirror serves sid's Release file past its Valid-Until date: say so, and let
        # apt in this chroot accept it (the signature is still checked).
        grep -q "is expired" "$apt_log" || apt_failed
        log "WARNING: the mirror's $suite Release file is past its Valid-Until date;" \
            "apt in this chroot will not check Valid-Until"
        echo 'Acquire::Check-Valid-Until "false";' > "$root/etc/apt/apt.conf.d/02-seaway-expired-release"
        chroot_apt update -qq || apt_failed
    fi
    log "apt: installing ${PACKAGES[*]}"
    chroot_apt install -y -q "${PACKAGES[@]}" || apt_failed
    chroot_apt clean || apt_failed
    echo "$key" > "$stamp"
    phase_end apt "$start"
fi

# ------------------------------------------------------------------ test
copy_host_config  # again: package scripts (ca-certificates) rewrite /etc/ssl/certs
mount_system
bind "$here" "$root$here"

envs=(PATH=/usr/local/sbin:/usr/local/bin:/usr/sbin:/usr/bin:/sbin:/bin HOME=/root LANG=C.UTF-8
      DEBIAN_FRONTEND=noninteractive "SEAWAY_VENV=$venv")
while IFS='=' read -r name _; do
    case "$name" in
        PIP_*|SSL_CERT_*|REQUESTS_CA_BUNDLE|CURL_CA_BUNDLE|HTTPLIB2_CA_CERTS|CI|TERM|\
        http_proxy|https_proxy|no_proxy|HTTP_PROXY|HTTPS_PROXY|NO_PROXY)
            envs+=("$name=${!name}") ;;
    esac
done < <(env)
inside() { chroot "$root" /usr/bin/env -i "${envs[@]}" bash -c "$1" bash "${@:2}"; }

inside 'echo "chroot-test['"$suite"']: $(. /etc/os-release; echo "$PRETTY_NAME"), $(python3 --version)";
        dpkg-query -W -f="chroot-test['"$suite"']:   \${Package} \${Version}\n" \
            qgis python3-numpy python3-scipy python3-gdal python3-shapely python3-pyproj python3-pytest'

start=$(date +%s)
rc=0
# Extra arguments are make arguments run instead of `test` (e.g. `demo OUT=/tmp/demo-trixie`).
make_args=("${@:2}")
[ "${#make_args[@]}" -gt 0 ] || make_args=(test)
inside 'cd "$1" && shift && make "$@"' "$here" "${make_args[@]}" || rc=$?
phase_end tests "$start"
log "timings: ${timings[*]}; make ${make_args[*]} exit code $rc"
exit "$rc"
