# Registers the IndexKeeper daemon as a Windows service (run in an elevated PowerShell).
# Install steps: README.md, "Running as a service". The service stops cleanly on "Stop-Service IndexKeeper":
# the batch in flight finishes or is abandoned uncommitted and segments are sealed within Daemon:ShutdownGraceSeconds.
param(
    [string]$InstallDir = "C:\Program Files\IndexKeeper",
    [string]$Config = "C:\ProgramData\IndexKeeper\indexkeeper.json"
)
$ErrorActionPreference = "Stop"
$binary = Join-Path $InstallDir "indexkeeper.exe"
if (-not (Test-Path $binary)) { throw "indexkeeper.exe not found in $InstallDir (dotnet publish src/IndexKeeper.Cli -c Release -r win-x64 -o `"$InstallDir`")" }
if (-not (Test-Path $Config)) { throw "configuration $Config not found (start from config/indexkeeper.sample.json)" }
New-Service -Name "IndexKeeper" -DisplayName "IndexKeeper" `
    -Description "Keeps the page index true to the document store" `
    -BinaryPathName "`"$binary`" run --config `"$Config`"" -StartupType Automatic
# Restart after a failure, as the systemd unit does. The failure flag makes a stop with a non-zero exit code
# (the daemon's answer to a fault it cannot go past, docs/daemon.md "Faults") count as a failure too.
sc.exe failure IndexKeeper reset= 86400 actions= restart/10000/restart/10000/restart/60000 | Out-Null
sc.exe failureflag IndexKeeper 1 | Out-Null
Start-Service IndexKeeper
Write-Host "IndexKeeper is running; status page at http://127.0.0.1:7717/"
