#!/usr/bin/env bash
# Builds the FlowSolve API image from deploy/Dockerfile without pulling anything, with podman (or buildah).
#
# The Dockerfile's base images are build arguments whose defaults are the official .NET images. Our build machines
# cannot pull those, so this script assembles both base images locally from what the machine has, then builds the
# unchanged recipe on them with --pull=never:
#   - build stage, localhost/flowsolve-base-sdk: the installed .NET SDK (placed at /usr/share/dotnet, as in the
#     official SDK image), the Debian libraries it needs (libc, libstdc++, zlib, OpenSSL, ICU), /bin/sh for the RUN
#     lines and the CA bundle for NuGet's HTTPS. The build stage restores from nuget.org (host network).
#   - runtime stage, localhost/flowsolve-base-runtime: the .NET and ASP.NET Core shared runtimes of that SDK, the
#     dotnet host, and only the native libraries they load (their ELF dependencies, plus OpenSSL, which the runtime
#     opens on demand); /etc/passwd and /etc/group with the non-root "app" user (UID 1654, as in the official
#     images), an empty /tmp. No shell, no package manager, no other program.
#
# Usage: bash deploy/build-image.sh TAG
#   Installs podman and runc from Debian (apt-get, as root) when neither podman nor buildah is present.
#   FLOWSOLVE_ENGINE=buildah builds with buildah even when podman is present (installing it when missing).
#   FLOWSOLVE_BASE_TAG  suffix of the base images' tags (default "local"); existing base images with the same tag are
#                       reused, so a second build only rebuilds the application.
#   FLOWSOLVE_IMAGE_FILES  if set, the runtime image's file list (size, path) is written to this file.
# Prints the image's size and a summary of the files in its runtime stage.
set -euo pipefail

tag="${1:-}"
[ -n "$tag" ] || { echo "usage: bash deploy/build-image.sh TAG" >&2; exit 2; }
root="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
cd "$root"
started=$SECONDS

# --- engine ---------------------------------------------------------------------------------------------------------
apt_install() {
  [ "$(id -u)" = 0 ] || { echo "need root to install $* (apt-get)" >&2; exit 1; }
  echo "installing $* from Debian"
  apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "$@" >/dev/null
}
if ! command -v podman >/dev/null && ! command -v buildah >/dev/null; then apt_install podman runc; fi
command -v runc >/dev/null || apt_install runc
engine="${FLOWSOLVE_ENGINE:-podman}"
command -v podman >/dev/null || engine=buildah
command -v "$engine" >/dev/null || apt_install "$engine"
export CONTAINERS_CONF="${CONTAINERS_CONF:-$root/deploy/containers-ci.conf}"
image_exists() { if [ "$engine" = podman ]; then podman image exists "$1"; else buildah inspect --type image "$1" >/dev/null 2>&1; fi; }

# --- the machine's .NET ---------------------------------------------------------------------------------------------
command -v dotnet >/dev/null || { echo "no dotnet on PATH: the image is built from the installed .NET SDK" >&2; exit 1; }
dotnet_root="${DOTNET_ROOT:-$(dirname "$(readlink -f "$(command -v dotnet)")")}"
sdk_version="$(dotnet --version)"
[ -d "$dotnet_root/sdk/$sdk_version" ] || { echo "SDK $sdk_version not found under $dotnet_root" >&2; exit 1; }
# The shared runtimes the service runs on: the newest of the target framework's major version present in both.
major="$(sed -n 's:.*<TargetFramework>net\([0-9]*\)\..*</TargetFramework>.*:\1:p' Directory.Build.props | head -n 1)"
runtime_version="$(ls "$dotnet_root/shared/Microsoft.AspNetCore.App" | grep "^$major\." | sort -V | tail -n 1)"
[ -n "$runtime_version" ] && [ -d "$dotnet_root/shared/Microsoft.NETCore.App/$runtime_version" ] \
  || { echo "no .NET $major ASP.NET Core and .NET runtime pair under $dotnet_root/shared" >&2; exit 1; }
fxr_version="$(ls "$dotnet_root/host/fxr" | sort -V | tail -n 1)"
arch="$(uname -m)"
base_tag="${FLOWSOLVE_BASE_TAG:-local}"
sdk_image="localhost/flowsolve-base-sdk:$sdk_version-$base_tag"
runtime_image="localhost/flowsolve-base-runtime:$runtime_version-$base_tag"
echo "engine $engine $($engine --version | grep -o '[0-9][0-9.]*' | head -n 1), .NET SDK $sdk_version and runtime $runtime_version from $dotnet_root ($arch)"

# --- assembling a root file system from the host's files ------------------------------------------------------------
stage=""
work="$(mktemp -d /var/tmp/flowsolve-image.XXXXXX)"
trap 'rm -rf "$work"' EXIT
trap 'exit 130' INT TERM
# The engine's own temporary files (an interrupted podman build leaves its buildah* folder) go with ours.
mkdir -p "$work/tmp"
export TMPDIR="$work/tmp"

# add PATH...: queues host files for $stage at their canonical location (a symlinked directory such as /lib64 ->
# usr/lib64 resolved), symlinks kept as symlinks and followed, so that the target of every link comes too; flush
# copies the queue, one cp per folder (a per-file copy costs minutes on a busy machine).
# A missing path fails, unless lenient=1 (a package's file list names files a slimmed system may have dropped).
lenient=0
declare -A canonical=() queued=() batch=()
add() {
  local src dir dest target
  for src in "$@"; do
    if [ ! -e "$src" ] && [ ! -L "$src" ]; then
      [ "$lenient" = 1 ] && continue
      echo "missing on this machine: $src" >&2; return 1
    fi
    [ -d "$src" ] && [ ! -L "$src" ] && continue   # directories come with their files
    dir="${src%/*}"; dir="${dir:-/}"
    [ -n "${canonical[$dir]:-}" ] || canonical[$dir]="$(readlink -f "$dir")"
    dir="${canonical[$dir]}"
    dest="$dir/${src##*/}"
    [ -z "${queued[$dest]:-}" ] || continue
    queued[$dest]=1
    batch[$dir]+="$src"$'\n'
    if [ -L "$src" ]; then
      target="$(readlink "$src")"
      case "$target" in /*) ;; *) target="$dir/$target" ;; esac
      add "$target"
    fi
  done
}
flush() {
  local dir sources
  for dir in "${!batch[@]}"; do
    mkdir -p "$stage$dir"
    mapfile -t sources < <(printf '%s' "${batch[$dir]}")
    cp -a "${sources[@]}" "$stage$dir/"
  done
  canonical=(); queued=(); batch=()
}

# new_stage NAME: an empty root with the host's merged-/usr links (bin -> usr/bin ...), /tmp, and /etc/passwd, /etc/group.
new_stage() {
  stage="$work/$1"
  mkdir -p "$stage/etc" "$stage/usr/bin" "$stage/usr/lib" "$stage/usr/share"
  local d
  for d in bin sbin lib lib32 lib64 libx32; do
    if [ -L "/$d" ] && [ -d "/$d/" ]; then
      ln -s "$(readlink "/$d")" "$stage/$d"
      mkdir -p "$stage/$(dirname "$d")/$(readlink "/$d")"
    fi
  done
  install -d -m 1777 "$stage/tmp"
}

# shared_libraries FILE...: the absolute paths of the shared libraries these ELF files load at start (ldd).
shared_libraries() {
  local f
  for f in "$@"; do
    ldd "$f" 2>/dev/null | awk '$2 == "=>" && $3 ~ /^\// { print $3 } $1 ~ /^\// { print $1 }' || true
  done | sort -u
}
library_path() { ldconfig -p | awk -v lib="$1" '$1 == lib { print $NF; exit }'; }

# import IMAGE CHANGE...: the stage as a one-layer image with the given metadata (Dockerfile instructions).
import() {
  local image="$1"; shift
  if [ "$engine" = podman ]; then
    local changes=() c
    for c in "$@"; do changes+=(--change "$c"); done
    tar --numeric-owner -C "$stage" -cf - . | podman import "${changes[@]}" - "$image" >/dev/null
  else
    local ctr c
    ctr="$(buildah from scratch)"
    tar --numeric-owner -C "$stage" -cf "$work/layer.tar" .
    buildah add --quiet "$ctr" "$work/layer.tar" / >/dev/null
    for c in "$@"; do
      case "$c" in
        ENV\ *) buildah config --env "${c#ENV }" "$ctr" ;;
        WORKDIR\ *) buildah config --workingdir "${c#WORKDIR }" "$ctr" ;;
        *) echo "unsupported change: $c" >&2; return 1 ;;
      esac
    done
    buildah commit --quiet --rm "$ctr" "$image" >/dev/null
    rm -f "$work/layer.tar"
  fi
  rm -rf "$stage"
}

path_env="ENV PATH=/usr/local/sbin:/usr/local/bin:/usr/sbin:/usr/bin:/sbin:/bin"
users() {
  printf 'root:x:0:0:root:/root:/usr/sbin/nologin\napp:x:1654:1654::/home/app:/usr/sbin/nologin\n' >"$stage/etc/passwd"
  printf 'root:x:0:\napp:x:1654:\n' >"$stage/etc/group"
  install -d -o 1654 -g 1654 -m 0755 "$stage/home/app"
}

# --- build-stage base: the SDK on a minimal Debian userland ----------------------------------------------------------
if image_exists "$sdk_image"; then
  echo "reusing $sdk_image"
else
  echo "assembling $sdk_image"
  t=$SECONDS
  new_stage sdk
  users
  install -d -m 0700 "$stage/root"
  packages=(libc6 libgcc-s1 libstdc++6 zlib1g libssl3 dash)
  icu="$(dpkg-query -W -f '${Package}\n' 'libicu[0-9]*' 2>/dev/null | head -n 1 || true)"
  [ -n "$icu" ] && packages+=("$icu")
  for p in "${packages[@]}"; do
    mapfile -t files < <(dpkg -L "$p" | grep -vE '^/(\.|usr/share/(doc|man|lintian|bug|info)(/|$))')
    lenient=1 add "${files[@]}"
  done
  add /bin/sh /etc/ssl/certs/ca-certificates.crt
  if [ -e /usr/lib/ssl/openssl.cnf ]; then add /usr/lib/ssl/openssl.cnf /usr/lib/ssl/cert.pem; fi
  flush
  mkdir -p "$stage/usr/share/dotnet"
  for part in dotnet host shared packs sdk-manifests LICENSE.txt ThirdPartyNotices.txt; do
    [ -e "$dotnet_root/$part" ] && cp -a "$dotnet_root/$part" "$stage/usr/share/dotnet/"
  done
  mkdir -p "$stage/usr/share/dotnet/sdk"
  cp -a "$dotnet_root/sdk/$sdk_version" "$stage/usr/share/dotnet/sdk/"
  ln -sf ../share/dotnet/dotnet "$stage/usr/bin/dotnet"
  import "$sdk_image" "$path_env" "ENV HOME=/root" "ENV DOTNET_ROOT=/usr/share/dotnet" \
    "ENV DOTNET_CLI_TELEMETRY_OPTOUT=1" "ENV DOTNET_NOLOGO=1" "ENV DOTNET_SKIP_FIRST_TIME_EXPERIENCE=1" \
    "ENV DOTNET_GENERATE_ASPNET_CERTIFICATE=false" "ENV DOTNET_RUNNING_IN_CONTAINER=true" "ENV NUGET_XMLDOC_MODE=skip" \
    "ENV SSL_CERT_FILE=/etc/ssl/certs/ca-certificates.crt" "WORKDIR /"
  echo "assembled $sdk_image in $((SECONDS - t)) s"
fi

# --- runtime-stage base: the shared runtimes and the libraries they load -------------------------------------------
if image_exists "$runtime_image"; then
  echo "reusing $runtime_image"
else
  echo "assembling $runtime_image"
  t=$SECONDS
  new_stage runtime
  users
  dn="$stage/usr/share/dotnet"
  mkdir -p "$dn/host/fxr" "$dn/shared/Microsoft.NETCore.App" "$dn/shared/Microsoft.AspNetCore.App"
  cp -a "$dotnet_root/dotnet" "$dn/"
  for f in LICENSE.txt ThirdPartyNotices.txt; do [ -e "$dotnet_root/$f" ] && cp -a "$dotnet_root/$f" "$dn/"; done
  cp -a "$dotnet_root/host/fxr/$fxr_version" "$dn/host/fxr/"
  cp -a "$dotnet_root/shared/Microsoft.NETCore.App/$runtime_version" "$dn/shared/Microsoft.NETCore.App/"
  cp -a "$dotnet_root/shared/Microsoft.AspNetCore.App/$runtime_version" "$dn/shared/Microsoft.AspNetCore.App/"
  ln -s ../share/dotnet/dotnet "$stage/usr/bin/dotnet"
  # Every ELF file of the runtime and what it links (ldd), and OpenSSL, which System.Security.Cryptography opens
  # with dlopen when the service first hashes or compares with a key; no ICU (the build sets InvariantGlobalization).
  mapfile -t elves < <(find "$dn" -type f \( -name '*.so' -o -name dotnet -o -name createdump \))
  openssl=()
  for lib in libssl.so.3 libcrypto.so.3; do
    p="$(library_path "$lib")"; [ -n "$p" ] || { echo "$lib not found on this machine" >&2; exit 1; }
    openssl+=("$p")
  done
  mapfile -t libs < <(shared_libraries "${elves[@]}" "${openssl[@]}" | grep -v "^$dn/")
  add "${libs[@]}" "${openssl[@]}"
  flush
  import "$runtime_image" "$path_env" "ENV APP_UID=1654" "ENV ASPNETCORE_HTTP_PORTS=8080" \
    "ENV DOTNET_RUNNING_IN_CONTAINER=true" "ENV DOTNET_SYSTEM_GLOBALIZATION_INVARIANT=true" \
    "ENV DOTNET_VERSION=$runtime_version" "ENV ASPNET_VERSION=$runtime_version" "WORKDIR /"
  echo "assembled $runtime_image in $((SECONDS - t)) s"
fi

# --- the recipe itself ----------------------------------------------------------------------------------------------
echo "building $tag from deploy/Dockerfile (SDK_IMAGE=$sdk_image, RUNTIME_IMAGE=$runtime_image)"
args=(--pull=never --force-rm --network=host -f deploy/Dockerfile --build-arg "SDK_IMAGE=$sdk_image" --build-arg "RUNTIME_IMAGE=$runtime_image" -t "$tag")
t=$SECONDS
if [ "$engine" = podman ]; then
  # --layers=false: no cached intermediate images left behind (the SDK layers are rebuilt each time anyway).
  podman build --layers=false "${args[@]}" .
else
  buildah bud --layers=false "${args[@]}" .
fi
echo "built $tag from the recipe in $((SECONDS - t)) s"

# --- what was built --------------------------------------------------------------------------------------------------
if [ "$engine" = podman ]; then
  size="$(podman image inspect --format '{{.Size}}' "$tag")"
  size_text="$(awk -v b="$size" 'BEGIN { printf "%.1f MB (%d bytes)", b / 1e6, b }')"
  ctr="$(podman create "$tag")"
  podman export "$ctr" >"$work/rootfs.tar"
  podman rm "$ctr" >/dev/null
else
  size_text="$(buildah images --format '{{.Size}}' "$tag" | head -n 1)"
  ctr="$(buildah from --pull=never "$tag")"
  mnt="$(buildah mount "$ctr")"
  tar -C "$mnt" -cf "$work/rootfs.tar" .
  buildah umount "$ctr" >/dev/null; buildah rm "$ctr" >/dev/null
fi
tar -tvf "$work/rootfs.tar" | awk '{ name = $6; for (i = 7; i <= NF; i++) name = name " " $i; print $3 "\t" name }' \
  | sed -E 's:\t(\./|/)?:\t/:' | sort -t"$(printf '\t')" -k2 >"$work/files.txt"
[ -n "${FLOWSOLVE_IMAGE_FILES:-}" ] && cp "$work/files.txt" "$FLOWSOLVE_IMAGE_FILES"
echo "image $tag: $size_text, built in $((SECONDS - started)) s"
echo "runtime stage: $(grep -c . "$work/files.txt") entries; bytes by top-level folder:"
awk -F'\t' '{ sub(/ -> .*/, "", $2); split($2, p, "/"); top = "/" p[2]; if (p[3] != "" && (p[2] == "usr" || p[2] == "etc")) top = top "/" p[3]; s[top] += $1; n[top]++ }
  END { for (t in s) printf "  %-28s %6d files %10.1f MB\n", t, n[t], s[t] / 1e6 }' "$work/files.txt" | sort
