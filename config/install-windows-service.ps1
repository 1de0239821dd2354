# Registers the IndexKeeper daemon as a Windows service (run in an elevated PowerShell).
# Install steps: README.md, "Running as a service"; accounts and UNC roots: docs/service.md.
# The service stops cleanly on "Stop-Service IndexKeeper": the batch in flight finishes or is abandoned
# uncommitted and segments are sealed within Daemon:ShutdownGraceSeconds.
# Not yet run on a Windows machine by the project's tests.
param(
    [string]$InstallDir = "C:\Program Files\IndexKeeper",
    [string]$Config = "C:\ProgramData\IndexKeeper\indexkeeper.json",
    # The index directory named in the configuration (Index); the service account gets write access to it only.
    [string]$IndexDir = "C:\ProgramData\IndexKeeper\index",
    # Local roots the service reads (UNC roots are granted on the share instead: docs/service.md).
    [string[]]$Roots = @()
)
$ErrorActionPreference = "Stop"
$name = "IndexKeeper"
# A virtual service account: created by Windows for this service alone, no password, no interactive logon.
# On the network it acts as the computer account (DOMAIN\COMPUTER$).
$account = "NT SERVICE\$name"
$binary = Join-Path $InstallDir "indexkeeper.exe"
if (-not (Test-Path $binary)) { throw "indexkeeper.exe not found in $InstallDir (dotnet publish src/IndexKeeper.Cli -c Release -r win-x64 -o `"$InstallDir`")" }
if (-not (Test-Path $Config)) { throw "configuration $Config not found (start from config/indexkeeper.sample.json)" }
New-Service -Name $name -DisplayName "IndexKeeper" `
    -Description "Keeps the page index true to the document store" `
    -BinaryPathName "`"$binary`" run --config `"$Config`"" -StartupType Automatic
sc.exe config $name obj= "$account" | Out-Null
if ($LASTEXITCODE -ne 0) { throw "sc.exe config $name obj= $account failed ($LASTEXITCODE)" }

# Write access to the index only; read access to the configuration (and the token file beside it) and the roots.
New-Item -ItemType Directory -Force -Path $IndexDir | Out-Null
icacls $IndexDir /grant "${account}:(OI)(CI)M" | Out-Null
icacls (Split-Path $Config) /grant "${account}:(OI)(CI)RX" | Out-Null
foreach ($root in $Roots) { icacls $root /grant "${account}:(OI)(CI)RX" | Out-Null }

# Restart after a failure, as the systemd unit does. The failure flag makes a stop with a non-zero exit code
# (the daemon's answer to a fault it cannot go past, docs/daemon.md "Faults") count as a failure too.
sc.exe failure $name reset= 86400 actions= restart/10000/restart/10000/restart/60000 | Out-Null
sc.exe failureflag $name 1 | Out-Null
Start-Service $name
Write-Host "IndexKeeper is running as $account; status page at http://127.0.0.1:7717/"
