package batch

import (
	"context"
	"crypto/rand"
	"errors"
	"fmt"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"
)

// The Slurm test runs the test binary itself as the array's tasks: with
// slurmWorkerEnv set, TestMain runs one shard of a small batch (shard
// SLURM_ARRAY_TASK_ID of SLURM_ARRAY_TASK_COUNT) with the fake runner and
// exits, so the test does not depend on the command-line program.
const (
	slurmWorkerEnv   = "SLIPFRONT_BATCH_TEST_WORKER"
	slurmScenarioEnv = "SLIPFRONT_BATCH_TEST_SCENARIO"
	slurmOutEnv      = "SLIPFRONT_BATCH_TEST_OUT"
	slurmRealEnv     = "SLIPFRONT_BATCH_TEST_REALIZATIONS"
	slurmSweepEnv    = "SLIPFRONT_BATCH_TEST_SWEEP"
)

func TestMain(m *testing.M) {
	if os.Getenv(slurmWorkerEnv) == "1" {
		os.Exit(slurmWorker())
	}
	os.Exit(m.Run())
}

// slurmWorker runs the shard given by Slurm's array variables into
// $SLIPFRONT_BATCH_TEST_OUT/shard-<i>.
func slurmWorker() int {
	fail := func(err error) int {
		fmt.Fprintln(os.Stderr, "batch test worker:", err)
		return 1
	}
	shard, err := ParseShard(os.Getenv("SLURM_ARRAY_TASK_ID") + "/" + os.Getenv("SLURM_ARRAY_TASK_COUNT"))
	if err != nil {
		return fail(err)
	}
	n, err := strconv.Atoi(os.Getenv(slurmRealEnv))
	if err != nil {
		return fail(err)
	}
	sweep, err := ParseSweep(os.Getenv(slurmSweepEnv))
	if err != nil {
		return fail(err)
	}
	tinyPath = os.Getenv(slurmScenarioEnv)
	sum, err := Run(context.Background(), Options{
		Load: loader(), Realizations: n, Sweeps: []Sweep{sweep}, Workers: 1, Shard: shard,
		Out: filepath.Join(os.Getenv(slurmOutEnv), fmt.Sprintf("shard-%d", shard.Index)), Resume: true,
		Run: fakeRun, Progress: os.Stdout,
	})
	if err != nil {
		return fail(err)
	}
	fmt.Printf("shard %s: %d results\n", shard, sum.Ran)
	return 0
}

// TestSlurmArray starts a private one-machine Slurm (munged, slurmctld,
// slurmd with their own config, key, socket, ports and state in a
// temporary folder, pointed to by SLURM_CONF), submits a 4-task
// array whose tasks run shards 0/4 … 3/4, polls squeue until it is done,
// merges the shards and compares the result with the same batch run in
// this process, byte for byte. Every daemon it starts is stopped.
func TestSlurmArray(t *testing.T) {
	for _, tool := range []string{"sbatch", "squeue", "scontrol", "sinfo", "slurmctld", "slurmd", "munged", "munge"} {
		if _, err := exec.LookPath(tool); err != nil {
			t.Skipf("Slurm test skipped: %s not installed (CI installs slurm-wlm and munge)", tool)
		}
	}
	if os.Geteuid() != 0 {
		t.Skip("Slurm test skipped: starting slurmctld and slurmd as a private cluster needs root")
	}
	scenario, err := filepath.Abs(tinyPath)
	if err != nil {
		t.Fatal(err)
	}
	const realizations, sweep = 8, "fluids.slickwater.viscosity=1 cP,20 cP"
	cl := startSlurm(t)

	bin, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	script := filepath.Join(cl.dir, "shard.sh")
	if err := os.WriteFile(script, []byte("#!/bin/sh\nexec \"$SLIPFRONT_BATCH_TEST_BIN\"\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	shards := filepath.Join(cl.dir, "shards")
	sub := cl.command("sbatch", "--parsable", "--array=0-3", "--job-name=slipfront-batch-test",
		"--output="+filepath.Join(cl.dir, "log", "task-%A_%a.out"), "--chdir="+cl.dir, script)
	sub.Env = append(sub.Env, slurmWorkerEnv+"=1", "SLIPFRONT_BATCH_TEST_BIN="+bin, slurmScenarioEnv+"="+scenario,
		slurmOutEnv+"="+shards, slurmRealEnv+"="+strconv.Itoa(realizations), slurmSweepEnv+"="+sweep)
	out, err := sub.CombinedOutput()
	if err != nil {
		cl.dumpLogs(t)
		t.Fatalf("sbatch: %v: %s", err, out)
	}
	jobID, _, _ := strings.Cut(strings.TrimSpace(string(out)), ";")
	// Poll squeue (sbatch --wait returns only about 2, 10 or 42 s after
	// submission with slurm-wlm 22.05, a coarse schedule).
	if !cl.waitFor(40*time.Second, func() bool {
		q, err := cl.command("squeue", "-h", "-j", jobID).Output()
		return err != nil || strings.TrimSpace(string(q)) == ""
	}) {
		cl.dumpLogs(t)
		t.Fatalf("array job %s still queued or running after 40 s", jobID)
	}

	// Slurm may report success for tasks that never ran (a failing process
	// tracker is recorded as COMPLETED 0:0), so check the folders, not exit codes.
	var dirs []string
	for i := range 4 {
		d := filepath.Join(shards, fmt.Sprintf("shard-%d", i))
		m, err := readManifestFile(d)
		if err != nil || m.Shard != (Shard{Index: i, Count: 4}) {
			cl.dumpLogs(t)
			t.Fatalf("shard folder %s: %v (manifest %+v)", d, err, m)
		}
		dirs = append(dirs, d)
	}
	merged := filepath.Join(cl.dir, "merged")
	if err := Merge(context.Background(), dirs, merged, false); err != nil {
		cl.dumpLogs(t)
		t.Fatal(err)
	}
	local := filepath.Join(cl.dir, "local")
	runBatch(t, Options{Load: loader(), Realizations: realizations, Sweeps: []Sweep{mustSweep(t, sweep)}, Workers: 2, Out: local, Run: fakeRun})
	sameFiles(t, "Slurm array merged vs one process", aggregateFiles(t, local), aggregateFiles(t, merged))
}

// slurmCluster is a private single-node Slurm with its own munged.
type slurmCluster struct {
	dir, conf, socket string
}

func (cl *slurmCluster) command(name string, args ...string) *exec.Cmd {
	cmd := exec.Command(name, args...)
	cmd.Env = append(os.Environ(), "SLURM_CONF="+cl.conf)
	return cmd
}

// waitFor polls ok every 100 ms until it holds or the time is up.
func (cl *slurmCluster) waitFor(limit time.Duration, ok func() bool) bool {
	for deadline := time.Now().Add(limit); time.Now().Before(deadline); time.Sleep(100 * time.Millisecond) {
		if ok() {
			return true
		}
	}
	return ok()
}

func (cl *slurmCluster) dumpLogs(t *testing.T) {
	t.Helper()
	logs, _ := filepath.Glob(filepath.Join(cl.dir, "log", "*"))
	for _, p := range logs {
		b, _ := os.ReadFile(p)
		if len(b) > 6000 {
			b = b[len(b)-6000:]
		}
		t.Logf("==> %s <==\n%s", p, b)
	}
	if out, err := cl.command("sinfo", "-R").CombinedOutput(); err == nil {
		t.Logf("sinfo -R:\n%s", out)
	}
}

// freePort returns a TCP port that was free a moment ago.
func freePort(t *testing.T) int {
	t.Helper()
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	return l.Addr().(*net.TCPAddr).Port
}

// startSlurm starts munged, slurmctld and slurmd on private paths and
// ports and registers their shutdown with t.Cleanup.
func startSlurm(t *testing.T) *slurmCluster {
	dir, err := os.MkdirTemp("", "slipfront-slurm-")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.RemoveAll(dir) })
	// munged wants its socket folder reachable by everyone and its key
	// private to its owner.
	for _, d := range []string{dir, filepath.Join(dir, "munge")} {
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
		os.Chmod(d, 0o755)
	}
	for _, d := range []string{"state", "spool", "log"} {
		if err := os.MkdirAll(filepath.Join(dir, d), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	key := make([]byte, 128)
	rand.Read(key)
	keyFile := filepath.Join(dir, "munge", "munge.key")
	if err := os.WriteFile(keyFile, key, 0o600); err != nil {
		t.Fatal(err)
	}
	cl := &slurmCluster{dir: dir, conf: filepath.Join(dir, "slurm.conf"), socket: filepath.Join(dir, "munge", "munge.sock")}

	munged := exec.Command("munged", "--socket="+cl.socket, "--key-file="+keyFile,
		"--log-file="+filepath.Join(dir, "log", "munged.log"), "--pid-file="+filepath.Join(dir, "munge", "munged.pid"),
		"--seed-file="+filepath.Join(dir, "munge", "munged.seed"))
	if out, err := munged.CombinedOutput(); err != nil {
		cl.dumpLogs(t)
		t.Fatalf("munged: %v: %s", err, out)
	}
	t.Cleanup(func() {
		if out, err := exec.Command("munged", "--stop", "--socket="+cl.socket).CombinedOutput(); err != nil {
			t.Logf("munged --stop: %v: %s", err, out)
			killFromPidFile(t, filepath.Join(dir, "munge", "munged.pid"))
		}
	})
	if !cl.waitFor(10*time.Second, func() bool { return exec.Command("munge", "-n", "--socket="+cl.socket).Run() == nil }) {
		cl.dumpLogs(t)
		t.Fatal("munged did not answer within 10 s")
	}

	conf := fmt.Sprintf(`# Private single-node Slurm for slipfront's batch test.
ClusterName=slipfronttest
SlurmctldHost=localhost
SlurmctldPort=%d
SlurmdPort=%d
SlurmUser=root
AuthType=auth/munge
AuthInfo=socket=%[3]s
CredType=cred/munge
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
SchedulerParameters=batch_sched_delay=0
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
MpiDefault=none
ReturnToService=2
StateSaveLocation=%[4]s/state
SlurmdSpoolDir=%[4]s/spool
SlurmctldPidFile=%[4]s/slurmctld.pid
SlurmdPidFile=%[4]s/slurmd.pid
SlurmctldLogFile=%[4]s/log/slurmctld.log
SlurmdLogFile=%[4]s/log/slurmd.log
NodeName=localhost CPUs=%[5]d State=UNKNOWN
PartitionName=test Nodes=localhost Default=YES MaxTime=INFINITE State=UP
`, freePort(t), freePort(t), cl.socket, dir, runtime.NumCPU())
	if err := os.WriteFile(cl.conf, []byte(conf), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, daemon := range []string{"slurmctld", "slurmd"} {
		if out, err := cl.command(daemon).CombinedOutput(); err != nil {
			cl.dumpLogs(t)
			t.Fatalf("%s: %v: %s", daemon, err, out)
		}
	}
	t.Cleanup(func() { cl.stop(t) })
	if !cl.waitFor(15*time.Second, func() bool { return cl.command("scontrol", "ping").Run() == nil }) {
		cl.dumpLogs(t)
		t.Fatal("slurmctld did not answer within 15 s")
	}
	if !cl.waitFor(15*time.Second, func() bool {
		out, _ := cl.command("sinfo", "-h", "-n", "localhost", "-o", "%T").Output()
		return strings.TrimSpace(string(out)) == "idle"
	}) {
		cl.dumpLogs(t)
		t.Fatal("the node did not become idle within 15 s")
	}
	return cl
}

// stop shuts the controller and node daemon down, waiting for their pid
// files to go; daemons that outlive the wait are killed by their pids.
func (cl *slurmCluster) stop(t *testing.T) {
	if out, err := cl.command("scontrol", "shutdown").CombinedOutput(); err != nil {
		t.Logf("scontrol shutdown: %v: %s", err, out)
	}
	pids := []string{filepath.Join(cl.dir, "slurmctld.pid"), filepath.Join(cl.dir, "slurmd.pid")}
	gone := cl.waitFor(10*time.Second, func() bool {
		for _, p := range pids {
			if _, err := os.Stat(p); err == nil {
				return false
			}
		}
		return true
	})
	if !gone {
		t.Log("Slurm daemons still running 10 s after scontrol shutdown; killing them")
		for _, p := range pids {
			killFromPidFile(t, p)
		}
	}
}

// killFromPidFile ends the process whose id is in a daemon's pid file.
func killFromPidFile(t *testing.T, path string) {
	b, err := os.ReadFile(path)
	if err != nil {
		return
	}
	pid, err := strconv.Atoi(strings.TrimSpace(string(b)))
	if err != nil || pid <= 1 {
		return
	}
	if err := syscall.Kill(pid, syscall.SIGTERM); err != nil && !errors.Is(err, syscall.ESRCH) {
		t.Logf("kill %d: %v", pid, err)
	}
}
